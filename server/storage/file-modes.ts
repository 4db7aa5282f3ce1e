import { chmodSync, closeSync, existsSync, mkdirSync, openSync } from 'node:fs';

// The data folder holds privileged client material: its folders and files are the
// service account's alone (OWASP ASVS 4.0.3 V12.4.1 and V14.1; "least privilege" for
// file permissions is common practice). Modes are still reduced by the process umask,
// which can only take permissions away.
export const PRIVATE_DIR_MODE = 0o700;
export const PRIVATE_FILE_MODE = 0o600;

/** chmod, except on what another account owns (EPERM): its owner chose that mode. */
function tighten(target: string, mode: number): void {
  try {
    chmodSync(target, mode);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EPERM') throw error;
  }
}

/** Creates the folder (and parents) owner-only; tightens it if it already exists. */
export function ensurePrivateDir(dir: string): void {
  mkdirSync(dir, { recursive: true, mode: PRIVATE_DIR_MODE });
  tighten(dir, PRIVATE_DIR_MODE);
}

/** Creates an empty owner-only file, or tightens an existing one (e.g. the database and its -wal/-shm). */
export function ensurePrivateFile(file: string): void {
  if (!existsSync(file)) closeSync(openSync(file, 'a', PRIVATE_FILE_MODE));
  tighten(file, PRIVATE_FILE_MODE);
}
