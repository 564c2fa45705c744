import 'reflect-metadata';
import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { Config } from './config';
import type { AppContext } from './context';
import { requireCsrf } from './auth/csrf';
import { createPassport } from './auth/passport';
import { SqliteSessionStore } from './auth/session-store';
import { crashNetMiddleware } from './lib/crash-net';
import { errorMiddleware } from './lib/error-middleware';
import { AppError } from './lib/errors';
import { buildOpenApi } from './lib/openapi';
import { mountRoutes, type MountedRoute, type RouteDef } from './lib/route';
import { authRoutes } from './features/auth/auth.router';
import { createAuthService } from './features/auth/auth.service';
import { basemapApiRoutes, basemapTileRoutes } from './features/basemaps/basemaps.router';
import { createBasemapsService } from './features/basemaps/basemaps.service';
import type { Mailer } from './features/mail/mailer';
import { createMailWorker, type MailWorker, type MailWorkerOptions } from './features/mail/outbox';
import { exportsRoutes } from './features/exports/exports.router';
import { fitsRoutes } from './features/fits/fits.router';
import { reportsRoutes } from './features/reports/reports.router';
import { mapRoutes } from './features/map/map.router';
import { kSurfaceRoutes } from './features/ksurface/ksurface.router';
import { outlinesRoutes } from './features/ksurface/outlines.router';
import { sketchesRoutes } from './features/ksurface/sketches.router';
import { membersRoutes } from './features/members/members.router';
import { recordsRoutes } from './features/records/records.router';
import { sitesRoutes } from './features/sites/sites.router';
import { adminRoutes } from './features/users/users.router';
import { mountViewPage, viewerLinksRoutes, viewRoutes } from './features/viewer-links/viewer-links.router';
import { wellsRoutes } from './features/wells/wells.router';

export const VERSION = '0.1.0';

export interface KfieldApp {
  app: Express;
  routes: MountedRoute[];
  store: SqliteSessionStore;
  /** The outbox's delivery worker (tests drain it). */
  mail: MailWorker;
  close(): Promise<void>;
}

export interface AppDeps {
  config: Config;
  ds: DataSource;
  /** The relay the outbox worker delivers to. */
  mailer: Mailer;
  mailOptions?: MailWorkerOptions;
  log?: (msg: string, e?: unknown) => void;
}

export function createApp({ config, ds, mailer, mailOptions, log = (m, e) => console.error(m, e) }: AppDeps): KfieldApp {
  const mail = createMailWorker(ds, mailer, { log, ...mailOptions });
  const ctx: AppContext = { config, ds, outbox: mail };
  const app = express();
  app.disable('x-powered-by');
  app.use(crashNetMiddleware);
  if (config.TRUST_PROXY) app.set('trust proxy', 1);

  // Tiles, glyphs and styles are public, hot and cookie-free: served first, ahead of helmet (they set
  // the two security headers that matter for them) and of the session middleware.
  const basemaps = createBasemapsService(ctx, (m) => log(m, ''));
  const tileMounted: MountedRoute[] = [];
  const tiles = express.Router();
  mountRoutes(tiles, ctx, basemapTileRoutes(ctx, basemaps), tileMounted);
  app.use(tiles);
  app.use('/tiles', (req) => {
    throw new AppError('NOT_FOUND', `No tile route ${req.method} ${req.originalUrl}`, 404);
  });

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          // maplibre and the charts set element styles; no remote style sheets.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'"],
          // maplibre-gl runs its tile workers from a same-origin script or a blob.
          'worker-src': ["'self'", 'blob:'],
          'child-src': ["'self'", 'blob:'],
          'object-src': ["'none'"],
          'frame-ancestors': ["'none'"],
          'upgrade-insecure-requests': config.COOKIE_SECURE ? [] : null,
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );

  // A viewer link's page and read-only API: no account, so they come before the session middleware
  // (no session is read, made or touched for a viewer).
  const dist = path.resolve(config.CLIENT_DIST);
  const viewMounted: MountedRoute[] = [];
  const views = express.Router();
  mountRoutes(views, ctx, viewRoutes(ctx), viewMounted);
  app.use(views);
  mountViewPage(app, ctx, path.join(dist, 'index.html'));

  const store = new SqliteSessionStore(ds, config.SESSION_IDLE_SECONDS * 1000);
  const pp = createPassport(ctx);

  app.use('/api', express.json({ limit: '1mb' }));
  app.use(
    session({
      name: 'kfield.sid',
      secret: config.SESSION_SECRET,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: config.COOKIE_SECURE, maxAge: config.SESSION_IDLE_SECONDS * 1000 },
    }),
  );
  // Absolute lifetime: a signed-in session ends this long after sign-in, however active it is.
  app.use((req, _res, next) => {
    const started = req.session?.signedInAtMs;
    if (started && Date.now() - started > config.SESSION_ABSOLUTE_SECONDS * 1000) {
      // regenerate destroys the old row and starts an empty, signed-out session.
      return req.session.regenerate((e) => next(e));
    }
    next();
  });
  app.use(pp.initialize());
  app.use(pp.session());
  app.use('/api', requireCsrf);

  const auth = createAuthService(ctx, store);
  const defs: RouteDef[] = [
    {
      method: 'get', path: '/api/health', tag: 'Instance', summary: 'Liveness and database check',
      responses: { 200: { description: 'Healthy', schema: z.object({ status: z.literal('ok'), version: z.string(), database: z.literal('ok') }) } },
      handler: async () => {
        await ds.query('SELECT 1');
        return { status: 'ok', version: VERSION, database: 'ok' };
      },
    },
    {
      method: 'get', path: '/api/openapi.json', tag: 'Instance', summary: 'This OpenAPI 3.1 document',
      responses: { 200: { description: 'OpenAPI document' } },
      handler: () => openapi,
    },
    ...authRoutes(ctx, pp, store),
    ...sitesRoutes(ctx),
    ...membersRoutes(ctx),
    ...wellsRoutes(ctx),
    ...recordsRoutes(ctx),
    ...fitsRoutes(ctx),
    ...mapRoutes(ctx),
    ...outlinesRoutes(ctx),
    ...kSurfaceRoutes(ctx),
    ...sketchesRoutes(ctx),
    ...exportsRoutes(ctx),
    ...reportsRoutes(ctx),
    ...viewerLinksRoutes(ctx),
    ...basemapApiRoutes(ctx, basemaps),
    ...adminRoutes(ctx, store, auth.sendReset, mail),
  ];
  const routes: MountedRoute[] = [...tileMounted, ...viewMounted];
  const api = express.Router();
  mountRoutes(api, ctx, defs, routes);
  const openapi = buildOpenApi(routes, VERSION);
  app.use(api);
  app.use('/api', (req) => {
    throw new AppError('NOT_FOUND', `No API route ${req.method} ${req.originalUrl}`, 404);
  });

  if (fs.existsSync(path.join(dist, 'index.html'))) {
    app.use(express.static(dist, { index: false, maxAge: '1h', setHeaders: (res, file) => {
      if (file.includes(`${path.sep}assets${path.sep}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
    } }));
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(dist, 'index.html')));
  }

  app.use(errorMiddleware(log));
  return {
    app, routes, store, mail,
    close: async () => {
      store.close();
      basemaps.close();
      await mail.stop();
    },
  };
}
