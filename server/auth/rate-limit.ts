import type { Response } from 'express';
import { rateLimited } from '../http/errors';

// Failed password checks (sign-in, accepting an invitation with an existing account, the
// current password on a password change) are throttled together, per account. The
// throttle must not itself become a way to shut the owner out (OWASP Authentication
// Cheat Sheet, "Account Lockout": an attacker can lock accounts on purpose; OWASP ASVS
// 4.0.3 V2.2.1: anti-automation "without locking out the account"), so:
// - per (account, client address): the first failures are free, then each further
//   failure from that address must wait a delay that doubles, up to the window;
// - per account, from every address together: a hard cap only far above what one
//   person mistypes, so a distributed guess of the password is still bounded;
// - per client address, over every account: a cap against password spraying, which
//   only shuts out that address.
// Only failed checks count. Counters live in memory, per server process.
export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
/** Failures per (account, address) in the window before delays begin. */
export const SIGN_IN_FREE_FAILURES_PER_ADDRESS = 5;
/** The first delay; each further failure from the same address doubles it (at most the window). */
export const SIGN_IN_FIRST_DELAY_MS = 30 * 1000;
/** Failures per account from all addresses together before every check waits out the window. */
export const SIGN_IN_MAX_FAILURES_PER_ACCOUNT = 100;
/** Failures from one address over all accounts before that address waits out the window. */
export const SIGN_IN_MAX_FAILURES_PER_IP = 20;

/** Remembered keys before expired ones are swept (bounds memory under a spray). */
const SWEEP_AT_KEYS = 20_000;

const normalise = (account: string) => account.trim().toLowerCase();

export class PasswordThrottle {
  private readonly failures = new Map<string, number[]>();

  /** `now` is injectable so tests can move the clock. */
  constructor(private readonly now: () => number = Date.now) {}

  /** Milliseconds this check must still wait (0: go ahead). */
  waitMs(account: string, address: string | null): number {
    const now = this.now();
    const pair = this.recent(`pair:${normalise(account)}|${address ?? ''}`, now);
    const perAccount = this.recent(`account:${normalise(account)}`, now);
    const perAddress = address ? this.recent(`ip:${address}`, now) : [];
    let until = 0;
    if (pair.length >= SIGN_IN_FREE_FAILURES_PER_ADDRESS) {
      const doublings = pair.length - SIGN_IN_FREE_FAILURES_PER_ADDRESS;
      const delay = Math.min(SIGN_IN_WINDOW_MS, SIGN_IN_FIRST_DELAY_MS * 2 ** doublings);
      until = Math.max(until, pair[pair.length - 1] + delay);
    }
    if (perAccount.length >= SIGN_IN_MAX_FAILURES_PER_ACCOUNT)
      until = Math.max(until, perAccount[0] + SIGN_IN_WINDOW_MS);
    if (perAddress.length >= SIGN_IN_MAX_FAILURES_PER_IP)
      until = Math.max(until, perAddress[0] + SIGN_IN_WINDOW_MS);
    return Math.max(0, until - now);
  }

  /**
   * Refuses with 429 and Retry-After (RFC 6585 section 4, RFC 9110 section 10.2.3) when
   * the check must wait; call before verifying the password.
   */
  assertAllowed(res: Response, account: string, address: string | null): void {
    const wait = this.waitMs(account, address);
    if (wait <= 0) return;
    const seconds = Math.max(1, Math.ceil(wait / 1000));
    res.set('Retry-After', String(seconds));
    const when = seconds < 120 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`;
    throw rateLimited(`Too many failed password attempts. Try again in ${when}.`);
  }

  recordFailure(account: string, address: string | null): void {
    const now = this.now();
    const keys = [`pair:${normalise(account)}|${address ?? ''}`, `account:${normalise(account)}`];
    if (address) keys.push(`ip:${address}`);
    for (const key of keys) {
      const list = this.recent(key, now);
      list.push(now);
      this.failures.set(key, list);
    }
    if (this.failures.size > SWEEP_AT_KEYS) this.sweep(now);
  }

  private recent(key: string, now: number): number[] {
    const list = this.failures.get(key);
    if (!list) return [];
    const kept = list.filter((at) => now - at < SIGN_IN_WINDOW_MS);
    if (kept.length === 0) this.failures.delete(key);
    else if (kept.length !== list.length) this.failures.set(key, kept);
    return kept;
  }

  private sweep(now: number): void {
    for (const key of [...this.failures.keys()]) this.recent(key, now);
  }
}
