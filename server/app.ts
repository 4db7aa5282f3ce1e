import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { JSON_BODY_LIMIT_BYTES } from '../shared/limits';
import type { AppContext } from './context';
import { csrfGuard } from './http/csrf';
import { apiNotFound, errorHandler } from './http/error-handler';
import { mountRoutes, type AnyRouteSpec } from './http/route';
import { apiRoutes } from './routes';

export interface AppOptions {
  /** Folder with the built client; served with an SPA fallback when it exists. */
  distDir?: string;
  /** The route list to mount (tests may pass extra routes). */
  routes?: readonly AnyRouteSpec[];
}

/**
 * The Express app: security headers, JSON body parsing, CSRF guard, session, every
 * declared API route under /api, JSON 404 for unknown /api paths, the built client
 * with SPA fallback, and the JSON error handler.
 */
export function createApp(ctx: AppContext, options: AppOptions = {}): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', ctx.config.trustProxy);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        // Fonts, scripts and styles are bundled: nothing loads from another origin.
        directives: {
          defaultSrc: ["'self'"],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:', 'blob:'],
          styleSrc: ["'self'", "'unsafe-inline'"],
          scriptSrc: ["'self'"],
          connectSrc: ["'self'"],
          frameSrc: ["'self'", 'blob:'],
          objectSrc: ["'none'"],
          upgradeInsecureRequests: null,
        },
      },
    }),
  );

  const api = express.Router();
  api.use(express.json({ limit: JSON_BODY_LIMIT_BYTES }));
  api.use(csrfGuard(ctx.config.publicOrigin));
  api.use(ctx.auth.middleware);
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  mountRoutes(api, ctx, options.routes ?? apiRoutes);
  api.use(apiNotFound);
  app.use('/api', api);
  app.locals.apiRouter = api;

  const distDir = resolve(options.distDir ?? join(process.cwd(), 'dist'));
  if (existsSync(join(distDir, 'index.html'))) {
    app.use(express.static(distDir, { index: false, maxAge: '1h' }));
    // Express 5 wildcard syntax; every client route gets index.html.
    app.get('/{*splat}', (_req, res) => {
      res.set('Cache-Control', 'no-cache');
      res.sendFile(join(distDir, 'index.html'));
    });
  }

  app.use(errorHandler(ctx.logger));
  return app;
}
