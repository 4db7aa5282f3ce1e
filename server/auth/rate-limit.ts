import type { RequestHandler } from 'express';
import { rateLimit, type Options } from 'express-rate-limit';
import { rateLimited } from '../http/errors';

// Failed sign-ins are limited per account and per client address. Only failed
// credential checks (401) count: successful sign-ins and malformed requests do not
// (OWASP Authentication Cheat Sheet, "Protect Against Automated Attacks").
export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
export const SIGN_IN_MAX_FAILURES_PER_ACCOUNT = 5;
export const SIGN_IN_MAX_FAILURES_PER_IP = 20;

const handler: Options['handler'] = (req, res, next) => {
  const resetTime = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
  const seconds = Math.max(
    1,
    Math.ceil(((resetTime?.getTime() ?? Date.now() + SIGN_IN_WINDOW_MS) - Date.now()) / 1000),
  );
  res.set('Retry-After', String(seconds));
  next(
    rateLimited(
      `Too many failed sign-in attempts. Try again in ${Math.ceil(seconds / 60)} minute(s).`,
    ),
  );
};

const common = {
  windowMs: SIGN_IN_WINDOW_MS,
  standardHeaders: false,
  legacyHeaders: false,
  skipSuccessfulRequests: true,
  requestWasSuccessful: (_req, res) => res.statusCode !== 401,
  handler,
} satisfies Partial<Options>;

/** Fresh limiters (with their own in-memory counters) for one app instance. */
export function signInRateLimits(): RequestHandler[] {
  return [
    rateLimit({ ...common, limit: SIGN_IN_MAX_FAILURES_PER_IP }),
    rateLimit({
      ...common,
      limit: SIGN_IN_MAX_FAILURES_PER_ACCOUNT,
      keyGenerator: (req) => {
        const email: unknown = (req.body as { email?: unknown } | undefined)?.email;
        return `account:${typeof email === 'string' ? email.trim().toLowerCase() : ''}`;
      },
    }),
  ];
}
