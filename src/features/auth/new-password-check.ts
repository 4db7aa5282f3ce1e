import { PASSWORD_MIN_LENGTH } from '@shared/limits';
import { newPasswordProblem, type PasswordContext } from '@shared/password-policy';

/**
 * The server's rules for a new password, checked before sending (the server checks
 * again): length, then shared/password-policy.ts, whose dictionary loads on first use.
 * Returns a sentence to show under the field, or null.
 */
export async function checkNewPassword(
  password: string,
  context: PasswordContext = {},
): Promise<string | null> {
  if (password.length < PASSWORD_MIN_LENGTH)
    return `Use at least ${PASSWORD_MIN_LENGTH} characters for the password.`;
  const problem = await newPasswordProblem(password, context);
  return problem ? `This password ${problem}.` : null;
}
