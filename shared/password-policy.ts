import type { ZxcvbnFactory } from '@zxcvbn-ts/core';

// What a new password must be beyond its length (shared/limits.ts), the same for the
// server, which enforces it, and the client forms, which check before sending:
// - not common, breached or easy to guess (OWASP ASVS 4.0.3 V2.1.7; NIST SP 800-63B
//   section 5.1.1.2 "values known to be commonly-used, expected, or compromised"):
//   zxcvbn-ts with its common package, whose password dictionary is a frequency list of
//   leaked passwords, plus the account's own name and e-mail as inputs; a score under 3
//   of 4 is refused (zxcvbn's guidance: 3 is "safely unguessable", common practice);
// - not the current password (ASVS V2.1.7 / V2.1.9 context: changing it must change it).
// The dictionary is large, so it is loaded on first use (a separate chunk in the client).

/** zxcvbn's score (0-4) a new password needs. */
export const PASSWORD_MIN_SCORE = 3;
/** Only this many leading characters are scored (zxcvbn's cost grows with length). */
export const PASSWORD_SCORED_LENGTH = 100;

export const PASSWORD_TOO_GUESSABLE =
  'is too easy to guess: it is, or is built from, a common or breached password, a keyboard or number pattern, or your own name or e-mail; try a phrase of four or more unrelated words';
export const PASSWORD_SAME_AS_CURRENT = 'must differ from the current password';

let factory: Promise<ZxcvbnFactory> | null = null;

function loadFactory(): Promise<ZxcvbnFactory> {
  factory ??= Promise.all([import('@zxcvbn-ts/core'), import('@zxcvbn-ts/language-common')]).then(
    ([core, common]) =>
      new core.ZxcvbnFactory({
        dictionary: { ...common.dictionary },
        graphs: common.adjacencyGraphs,
        maxLength: PASSWORD_SCORED_LENGTH,
      }),
  );
  return factory;
}

export interface PasswordContext {
  /** The account's e-mail and name: a password built from them is refused. */
  email?: string;
  name?: string;
  /** The password being replaced, when known (a password change). */
  current?: string;
}

/** Why `password` may not be chosen ("is too easy to guess: ..."), or null when it may. */
export async function newPasswordProblem(
  password: string,
  context: PasswordContext = {},
): Promise<string | null> {
  if (context.current !== undefined && password === context.current)
    return PASSWORD_SAME_AS_CURRENT;
  const zxcvbn = await loadFactory();
  // The e-mail, its local part with and without separators, its pieces and the name's words.
  const local = context.email?.split('@')[0] ?? '';
  const inputs = [
    context.email,
    local,
    local.replace(/[^\p{L}\p{N}]+/gu, ''),
    ...local.split(/[^\p{L}\p{N}]+/u),
    context.name,
    ...(context.name ?? '').split(/\s+/),
  ].filter((value): value is string => Boolean(value && value.length >= 3));
  const { score } = zxcvbn.check(password.slice(0, PASSWORD_SCORED_LENGTH), inputs);
  return score < PASSWORD_MIN_SCORE ? PASSWORD_TOO_GUESSABLE : null;
}
