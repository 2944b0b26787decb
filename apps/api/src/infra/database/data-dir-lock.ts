/**
 * An exclusive lock on the embedded database's folder, held for the life of the process. PGlite has no lock of its
 * own: two processes on one folder both accept writes and one's acknowledged writes are lost. The lock file
 * (<folder>/leadline.lock: pid, host, start time) is created atomically with its content (written to a private
 * file, then hard-linked into place, which fails if the name exists). A lock whose process is gone (same host,
 * no such pid) is stale and is taken over; a live one, or one from another host, refuses the start with a message
 * naming the folder and the holder.
 */
import { hostname } from 'node:os';
import { join } from 'node:path';
import { linkSync, readFileSync, renameSync, unlinkSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';

export const LOCK_FILE = 'leadline.lock';

interface LockContent {
  pid: number;
  host: string;
  startedAt: string;
}

/** The folder is held by another process (or another instance in this one). */
export class DataDirLockedError extends Error {
  constructor(
    readonly dir: string,
    readonly holder: LockContent | null,
    readonly reason: string,
  ) {
    super(
      `the embedded database folder ${dir} is locked by ${holder ? `process ${holder.pid} on ${holder.host} (since ${holder.startedAt})` : 'another process'}: ${reason}. ` +
        `Stop that process, or give this one another LEADLINE_DATA_DIR. If no such process exists, delete ${join(dir, LOCK_FILE)}.`,
    );
  }
}

const held = new Map<string, DataDirLock>();

export class DataDirLock {
  private released = false;
  constructor(
    readonly dir: string,
    readonly file: string,
    private readonly content: string,
  ) {}

  /** Removes the lock file if it is still ours. Idempotent. */
  release(): void {
    if (this.released) return;
    this.released = true;
    held.delete(this.dir);
    try {
      if (readFileSync(this.file, 'utf8') === this.content) unlinkSync(this.file);
    } catch {
      /* already gone */
    }
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM'; // exists, owned by someone else
  }
}

function readHolder(file: string): { text: string; holder: LockContent | null } | null {
  try {
    const text = readFileSync(file, 'utf8');
    try {
      const parsed = JSON.parse(text) as LockContent;
      return { text, holder: Number.isInteger(parsed.pid) ? parsed : null };
    } catch {
      return { text, holder: null };
    }
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
}

/**
 * Takes the lock on `dir` (an existing folder) or throws DataDirLockedError.
 * @param isAlive - whether a pid on this host is running (injectable for tests)
 */
export function lockDataDir(dir: string, isAlive: (pid: number) => boolean = alive): DataDirLock {
  if (held.has(dir)) throw new DataDirLockedError(dir, { pid: process.pid, host: hostname(), startedAt: 'now' }, 'it is already open in this process');
  const file = join(dir, LOCK_FILE);
  const me: LockContent = { pid: process.pid, host: hostname(), startedAt: new Date().toISOString() };
  const content = JSON.stringify(me) + '\n';
  const draft = join(dir, `.${LOCK_FILE}.${process.pid}.${randomBytes(4).toString('hex')}`);
  writeFileSync(draft, content, { flag: 'wx', mode: 0o644 });
  try {
    for (let attempt = 0; attempt < 5; attempt++) {
      try {
        linkSync(draft, file); // atomic: fails with EEXIST when a lock is there
        const lock = new DataDirLock(dir, file, content);
        held.set(dir, lock);
        return lock;
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      }
      const current = readHolder(file);
      if (!current) continue; // released meanwhile: try again
      const { holder } = current;
      if (!holder) throw new DataDirLockedError(dir, null, `its lock file ${file} is not readable as a lock`);
      if (holder.host !== me.host) throw new DataDirLockedError(dir, holder, 'it is held from another host, whose processes cannot be checked from here');
      // Our own pid but not held by us: a lock left by an earlier process that had the same pid (e.g. pid 1 in a container)
      const stale = holder.pid === process.pid || !isAlive(holder.pid);
      if (!stale) throw new DataDirLockedError(dir, holder, 'that process is running');
      // Take the stale lock over: move it aside under a private name (atomic, one process wins), and check that
      // what was moved is the stale lock that was read, not a fresh one another process has just created.
      const aside = `${draft}.stale`;
      try {
        renameSync(file, aside);
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') continue;
        throw err;
      }
      const moved = readFileSync(aside, 'utf8');
      if (moved !== current.text) {
        // We moved a live lock: put it back (link refuses if yet another lock appeared) and refuse
        try {
          linkSync(aside, file);
        } catch {
          /* another lock is in place */
        }
        unlinkSync(aside);
        throw new DataDirLockedError(dir, readHolder(file)?.holder ?? null, 'another process took the folder while this one started');
      }
      unlinkSync(aside);
    }
    throw new DataDirLockedError(dir, readHolder(file)?.holder ?? null, 'the lock kept changing while this process started');
  } finally {
    try {
      unlinkSync(draft);
    } catch {
      /* linked or gone */
    }
  }
}

// A process that ends without closing its app (crash with an exit handler, process.exit) removes its locks.
process.once('exit', () => {
  for (const lock of [...held.values()]) lock.release();
});
