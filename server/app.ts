import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type { Env } from './config/env';
import type { Services } from './container';
import { buildRouter, type CookieOptions } from './http/build-router';
import { notFound } from './http/errors';
import { csrfGuard } from './http/middlewares/csrf-guard';
import { errorHandler } from './http/middlewares/error-handler';
import { requestId } from './http/middlewares/request-id';
import { buildOpenApi } from './http/openapi';
import { allRoutes } from './http/routes';
import { defineRoute, publicAccess, type RouteDef } from './http/route-registry';
import type { Logger } from './lib/logger';
import type { HealthService } from './modules/health/health.service';
import type { BrokerHandle } from './ingest/broker';

export type AppDeps = {
  config: Env;
  logger: Logger;
  services: Services;
  health: HealthService;
  /** Login and reset rate limits; tests raise them. */
  authLimits?: { perIp: number; perEmail: number; windowMs: number };
  /** Serve the built client from this folder (production); absent in API-only tests. */
  clientDir?: string | null;
  /** The embedded MQTT broker, when this process runs one (probe disconnects, ingest counters). */
  broker?: BrokerHandle;
};

export type AppHandle = { app: Express; routes: RouteDef[] };

/** The Express app without listen(): index.ts serves it, tests mount it with supertest. */
export function createApp(deps: AppDeps): AppHandle {
  const { config, logger } = deps;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(requestId);
  app.use(
    pinoHttp({
      logger,
      genReqId: (_req, res) => String(res.getHeader('x-request-id') ?? ''),
      autoLogging: { ignore: (req) => req.url === '/api/health' },
    }),
  );
  app.use(
    helmet({
      // Served over plain http on loopback and the farm network: no HSTS and no upgrade of requests.
      strictTransportSecurity: false,
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'"],
          'worker-src': ["'self'", 'blob:'],
          'child-src': ["'self'", 'blob:'],
          'object-src': ["'none'"],
          'frame-ancestors': ["'none'"],
          'upgrade-insecure-requests': null,
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );
  app.use(cookieParser());
  app.use('/api', express.json({ limit: '1mb', type: ['application/json', 'application/*+json'] }));
  app.use('/api', csrfGuard([new URL(config.PUBLIC_URL).origin]));

  const cookie: CookieOptions = { secure: config.PUBLIC_URL.startsWith('https:'), maxAgeMs: config.JWT_TTL_SECONDS * 1000 };
  const routes = allRoutes(deps, cookie);
  routes.push(
    defineRoute({
      method: 'get',
      path: '/api/openapi.json',
      summary: 'This API as an OpenAPI 3.1 document, generated from the route registry.',
      tags: ['meta'],
      access: publicAccess,
      handler: () => ({ body: buildOpenApi(routes) }),
    }),
  );
  app.use(buildRouter(routes, deps.services.auth, cookie));
  app.use('/api', (_req, _res, next) => next(notFound('API route')));

  const clientDir = deps.clientDir === undefined ? resolve(config.CLIENT_DIST_DIR) : deps.clientDir ? resolve(deps.clientDir) : null;
  if (clientDir && existsSync(join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h', setHeaders: (res, path) => {
      if (path.includes(`${join(clientDir, 'assets')}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
    } }));
    // The client is a single-page app: every other GET answers index.html and the router takes over.
    app.get('/*splat', (req, res, next) => {
      if (req.path.startsWith('/api/')) return next();
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(join(clientDir, 'index.html'));
    });
  }
  app.use(errorHandler(logger));
  return { app, routes };
}
