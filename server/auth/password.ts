import { hash, verify, type Algorithm } from '@node-rs/argon2';
import { newPasswordProblem, type PasswordContext } from '../../shared/password-policy';
import { validationError } from '../http/errors';

// Argon2id with the minimum configuration recommended by the OWASP Password Storage
// Cheat Sheet (https://cheatsheetseries.owasp.org/cheatsheets/Password_Storage_Cheat_Sheet.html,
// "Argon2id"): m = 19456 KiB (19 MiB), t = 2 iterations, p = 1 degree of parallelism.
// Algorithm is a const enum in the typings and absent at runtime; 2 is Argon2id.
export const ARGON2_OPTIONS = {
  algorithm: 2 as Algorithm,
  memoryCost: 19456,
  timeCost: 2,
  parallelism: 1,
} as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

/** False (never a throw) for a wrong password or an unreadable hash. */
export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let dummyHash: Promise<string> | null = null;

/**
 * Spends the same work as a real check when the account does not exist, so the
 * response time does not reveal whether an e-mail is registered (OWASP Authentication
 * Cheat Sheet, "Authentication Responses").
 */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummyHash ??= hashPassword('quarry-dummy-password-for-constant-time');
  await verifyPassword(await dummyHash, password);
  return false;
}

/**
 * 400 naming `field` when a new password is common, breached, guessable or the current
 * one (shared/password-policy.ts; the client forms run the same check).
 */
export async function assertNewPassword(
  field: string,
  password: string,
  context: PasswordContext,
): Promise<void> {
  const problem = await newPasswordProblem(password, context);
  if (problem) throw validationError(field, problem);
}
