import type { Request, RequestHandler } from 'express';
import { HttpError } from './errors';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function originOf(value: string | undefined): string | null {
  if (!value) return null;
  try {
    return new URL(value).origin;
  } catch {
    return null;
  }
}

/** The origin the request was addressed to: scheme (trust-proxy aware) and Host header. */
export function ownOrigin(req: Request): string {
  return `${req.protocol}://${req.get('host') ?? ''}`;
}

/**
 * Cross-site request forgery defence for every mutating /api request (OWASP CSRF
 * Prevention Cheat Sheet, "Verifying Origin With Standard Headers"), on top of the
 * SameSite=Lax session cookie: the Origin header (or, when absent, the Referer's origin)
 * must equal the request's own origin or QUARRY_PUBLIC_ORIGIN. A request carrying
 * neither header is refused too: browsers send Origin on every POST/PUT/PATCH/DELETE.
 */
export function csrfGuard(publicOrigin: string | null): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const claimed = originOf(req.get('origin')) ?? originOf(req.get('referer'));
    const allowed = claimed !== null && (claimed === ownOrigin(req) || claimed === publicOrigin);
    if (allowed) return next();
    next(
      new HttpError(
        'csrf_rejected',
        claimed === null
          ? 'Cross-site request refused: the request has no Origin or Referer header.'
          : `Cross-site request refused: origin ${claimed} is not this site.`,
      ),
    );
  };
}
