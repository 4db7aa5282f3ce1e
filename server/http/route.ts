import type { Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import type { MatterPermission } from '../../shared/roles';
import type { AppContext } from '../context';
import { assertKnownAccess, requireAccess, type Access } from '../policy/policy';
import { HttpError } from './errors';
import type { MatterAccess, SessionUser } from './request-context';
import { validate, type ParsedInput, type RequestSchemas } from './validate';

export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

type Parsed<T, Fallback> = T extends z.ZodType ? z.output<T> : Fallback;

/** What a handler receives: parsed input, the caller and the app context. */
export interface RouteInput<A extends Access, S extends RequestSchemas> {
  ctx: AppContext;
  req: Request;
  res: Response;
  body: Parsed<S['body'], unknown>;
  query: Parsed<S['query'], Record<string, unknown>>;
  params: Parsed<S['params'], Record<string, string>>;
  /** Non-null on every route except 'public' ones. */
  user: A extends 'public' ? SessionUser | null : SessionUser;
  /** The caller's current role on :matterId; present on { matter: ... } routes. */
  matter: A extends { matter: MatterPermission } ? MatterAccess : undefined;
  /** Client address as Express sees it (honours the trust proxy setting). */
  ip: string | null;
}

/**
 * One API route. Paths are relative to /api ("/matters/:matterId/members").
 * The handler returns the JSON body (sent with `status`, default 200), or undefined
 * after writing the response itself (a file download); undefined with nothing sent
 * answers 204.
 */
export interface RouteSpec<A extends Access = Access, S extends RequestSchemas = RequestSchemas> {
  method: HttpMethod;
  path: string;
  access: A;
  /** The rule in development mode (QUARRY_DEV=1, `npm run dev`) instead of `access`. */
  devAccess?: Access;
  /**
   * Open to a session whose password a firm admin set and that must change it first
   * (reading me, changing the password). Every other signed-in route refuses it with 403
   * password_change_required (OWASP ASVS 4.0.3 V2.3.1).
   */
  beforePasswordChange?: boolean;
  schemas?: S;
  status?: number;
  /** One line for docs and the authorization-matrix test output. */
  summary: string;
  /** Extra middleware between the access check and validation (multer, rate limits). */
  middleware?: (ctx: AppContext) => RequestHandler[];
  handler: (input: RouteInput<A, S>) => unknown;
}

/** A route with its types erased, as kept in the route list. */
export interface AnyRouteSpec {
  method: HttpMethod;
  path: string;
  access: Access;
  devAccess?: Access;
  beforePasswordChange?: boolean;
  schemas?: RequestSchemas;
  status?: number;
  summary: string;
  middleware?: (ctx: AppContext) => RequestHandler[];
  handler: (input: RouteInput<Access, RequestSchemas>) => unknown;
}

/** Declares a route with its handler's input typed from `access` and `schemas`. */
export function defineRoute<
  const A extends Access,
  const S extends RequestSchemas = Record<never, never>,
>(spec: RouteSpec<A, S>): AnyRouteSpec {
  return spec as unknown as AnyRouteSpec;
}

/** Marks the terminal handler of every declared route; the matrix test looks for it. */
export const DECLARED_ROUTE = Symbol.for('quarry.declaredRoute');

type MarkedHandler = RequestHandler & { [DECLARED_ROUTE]?: AnyRouteSpec };

export function declaredSpecOf(handle: unknown): AnyRouteSpec | undefined {
  return (handle as MarkedHandler | undefined)?.[DECLARED_ROUTE];
}

/**
 * Mounts every route on `router` as: access check -> extra middleware -> validation ->
 * handler. Throws at start-up on a duplicate method+path or an unknown access rule.
 */
export function mountRoutes(
  router: Router,
  ctx: AppContext,
  routes: readonly AnyRouteSpec[],
): void {
  const seen = new Set<string>();
  for (const spec of routes) {
    const key = `${spec.method.toUpperCase()} ${spec.path}`;
    if (seen.has(key)) throw new Error(`route declared twice: ${key}`);
    seen.add(key);
    assertKnownAccess(spec.access, key);
    if (spec.devAccess) assertKnownAccess(spec.devAccess, key);
    const access = ctx.config.devMode && spec.devAccess ? spec.devAccess : spec.access;
    // Anything under a matter is scoped to its members (or firm admins on /admin routes).
    if (/:matterId(\/|$)/.test(spec.path) && typeof spec.access === 'string') {
      throw new Error(`${key}: a route with :matterId needs a { matter } or { firm } access rule`);
    }
    const handler: MarkedHandler = async (req, res) => {
      const parsed = res.locals.input as ParsedInput;
      const result = await spec.handler({
        ctx,
        req,
        res,
        body: parsed.body,
        query: parsed.query as Record<string, unknown>,
        params: parsed.params as Record<string, string>,
        user: req.auth?.user ?? null,
        matter: req.matterAccess,
        ip: req.ip ?? null,
      } as RouteInput<Access, RequestSchemas>);
      if (res.headersSent) return;
      if (result === undefined) res.status(204).end();
      else res.status(spec.status ?? 200).json(result);
    };
    handler[DECLARED_ROUTE] = spec;
    const passwordGate: RequestHandler = (req, _res, next) =>
      req.auth?.mustChangePassword && access !== 'public' && !spec.beforePasswordChange
        ? next(
            new HttpError(
              'password_change_required',
              'A firm administrator set your password: choose your own (My account) before anything else.',
            ),
          )
        : next();
    router[spec.method](
      spec.path,
      passwordGate,
      requireAccess(ctx.db, access),
      ...(spec.middleware?.(ctx) ?? []),
      validate(spec.schemas),
      handler,
    );
  }
}
