import { z } from 'zod';
import {
  EMAIL_MAX_LENGTH,
  NAME_MAX_LENGTH,
  PASSWORD_MAX_LENGTH,
  PASSWORD_MIN_LENGTH,
} from '../limits';
import { MATTER_ROLES } from '../roles';

// Building blocks for request schemas. Messages read after the field name:
// "email: must be an e-mail address".

/** A required string; "is required" when missing, "must be text" for another type. */
export const text = () =>
  z.string({ error: (issue) => (issue.input === undefined ? 'is required' : 'must be text') });

export const emailSchema = text()
  .trim()
  .toLowerCase()
  .max(EMAIL_MAX_LENGTH, `must be at most ${EMAIL_MAX_LENGTH} characters`)
  .pipe(z.email({ error: 'must be an e-mail address' }));

/** A new password (sign-in accepts any stored password; see auth.ts). */
export const newPasswordSchema = text()
  .min(PASSWORD_MIN_LENGTH, `must be at least ${PASSWORD_MIN_LENGTH} characters`)
  .max(PASSWORD_MAX_LENGTH, `must be at most ${PASSWORD_MAX_LENGTH} characters`);

export const personNameSchema = text()
  .trim()
  .min(1, 'is required')
  .max(NAME_MAX_LENGTH, `must be at most ${NAME_MAX_LENGTH} characters`);

export const roleSchema = z.enum(MATTER_ROLES, {
  error: (issue) =>
    issue.input === undefined ? 'is required' : `must be one of ${MATTER_ROLES.join(', ')}`,
});

/** Positive integer id from a path or query string. */
export const idSchema = z.coerce
  .number({ error: 'must be a number' })
  .int('must be a whole number')
  .positive('must be positive');

export const matterParams = z.object({ matterId: idSchema });
export type MatterParams = z.infer<typeof matterParams>;

/** A person as other people see them in lists. */
export interface PersonRef {
  id: string;
  name: string;
  email: string;
}
