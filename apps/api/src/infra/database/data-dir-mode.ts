/**
 * The embedded database folder is the service's alone: the folder and every folder in it 0700, every file 0600
 * (PGlite writes most of its files 0666 whatever the umask). Set when the folder is opened, again once the
 * migrations have run, and when the database is closed; a file PGlite creates while the service runs lies inside a
 * 0700 folder, which no other user can enter.
 */
import { chmodSync, lstatSync, readdirSync } from 'node:fs';
import { join } from 'node:path';

export const DATA_DIR_MODE = 0o700;
export const DATA_FILE_MODE = 0o600;

/** Restricts a folder and everything under it to its owner (symbolic links are left alone, never followed). */
export function restrictDataDir(dir: string): void {
  const walk = (folder: string) => {
    chmodSync(folder, DATA_DIR_MODE);
    for (const entry of readdirSync(folder, { withFileTypes: true })) {
      const path = join(folder, entry.name);
      if (entry.isDirectory()) walk(path);
      else if (entry.isFile() && (lstatSync(path).mode & 0o777) !== DATA_FILE_MODE) chmodSync(path, DATA_FILE_MODE);
    }
  };
  walk(dir);
}
