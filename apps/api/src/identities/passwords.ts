/**
 * Password hashing and the password policy. Argon2id at OWASP's minimum parameters (OWASP Password Storage Cheat
 * Sheet, 2024: m = 19 MiB, t = 2, p = 1); length limits from NIST SP 800-63B-4 §3.1.1.2 (at least 15 characters for
 * a password used alone; at least 64 accepted; no composition rules).
 */
import argon2 from 'argon2';

export const ARGON2_OPTIONS = { type: argon2.argon2id, memoryCost: 19 * 1024, timeCost: 2, parallelism: 1 } as const;
export const PASSWORD_MIN = 15;
export const PASSWORD_MAX = 256;

export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, ARGON2_OPTIONS);
}

/** A hash of no one's password, verified when no account matches, so that an unknown email costs the same time. */
let decoy: Promise<string> | null = null;

/** True when `password` matches `hash`; with no hash, spends the same work and answers false. */
export async function verifyPassword(hash: string | null, password: string): Promise<boolean> {
  if (hash === null) {
    decoy ??= hashPassword('leadline decoy password, never set');
    await argon2.verify(await decoy, password);
    return false;
  }
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}
