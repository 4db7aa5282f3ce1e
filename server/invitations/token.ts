import { createHash, randomBytes } from 'node:crypto';

/** 32 random bytes as base64url (43 characters): the secret in the invitation link. */
export function newInvitationToken(): string {
  return randomBytes(32).toString('base64url');
}

/** Only this SHA-256 hash is stored, so a database leak does not leak usable links. */
export function hashInvitationToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
