import type SQLite from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';
import { createPassport } from './auth/passport';
import { KyselySessionStore } from './auth/session-store';
import type { Config } from './config';
import type { Db } from './db/database';
import { apiNotFound, errorHandler } from './errors/error-handler';
import type { IngestRuntime } from './ingest-runtime';
import type { Mailer } from './mail/mailer';
import { csrfProtection, xsrfCookie } from './middleware/csrf';
import { adminRoutes } from './routes/admin.routes';
import { analysesRoutes } from './routes/analyses.routes';
import { authRoutes } from './routes/auth.routes';
import { exportsRoutes } from './routes/exports.routes';
import { estimateRoutes } from './routes/estimate.routes';
import { healthRoutes } from './routes/health.routes';
import { identifyRoutes } from './routes/identify.routes';
import { curateRoutes } from './routes/curate.routes';
import { deploymentsRoutes } from './routes/deployments.routes';
import { photosRoutes } from './routes/photos.routes';
import { projectsRoutes } from './routes/projects.routes';
import { sessionsRoutes } from './routes/sessions.routes';
import { sortRoutes } from './routes/sort.routes';
import { stationsRoutes } from './routes/stations.routes';
import { uploadsRoutes } from './routes/uploads.routes';

/** What the app needs from the outside world; tests pass their own. */
export interface AppDeps {
  db: Db;
  config: Config;
  log: Logger;
  mailer: Mailer;
  ingest: IngestRuntime;
  /** The raw SQLite handle, for the online backup API (falls back to VACUUM INTO without it). */
  sqlite?: SQLite.Database;
}

export const SESSION_COOKIE = 'maculo.sid';
const JSON_LIMIT = '1mb';

/** Builds the Express app (API and the built client) and nothing else: no listening, no timers to await. */
export function createApp(deps: AppDeps): Express {
  const { db, config, log } = deps;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'img-src': ["'self'", 'data:', 'blob:'],
          'style-src': ["'self'", "'unsafe-inline'"],
          'upgrade-insecure-requests': config.secureCookies ? [] : null,
        },
      },
      strictTransportSecurity: config.secureCookies,
    }),
  );
  app.use(xsrfCookie({ secure: config.secureCookies }));
  app.use(
    pinoHttp({ logger: log, autoLogging: { ignore: (req) => !req.url?.startsWith('/api') } }),
  );

  const store = new KyselySessionStore(db);
  const passport = createPassport(db);
  const api = express.Router();
  api.use(express.json({ limit: JSON_LIMIT }));
  api.use(
    session({
      name: SESSION_COOKIE,
      secret: config.sessionSecret,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.secureCookies,
        maxAge: 14 * 24 * 60 * 60 * 1000,
      },
    }),
  );
  api.use(passport.initialize());
  api.use(passport.session());
  api.use(csrfProtection());

  api.use(healthRoutes(deps));
  api.use(authRoutes(deps, passport));
  api.use(projectsRoutes(deps));
  api.use(adminRoutes(deps));
  api.use(stationsRoutes(deps));
  api.use(deploymentsRoutes(deps));
  api.use(uploadsRoutes(deps));
  api.use(photosRoutes(deps));
  api.use(sortRoutes(deps));
  api.use(identifyRoutes(deps));
  api.use(curateRoutes(deps));
  api.use(estimateRoutes(deps));
  api.use(sessionsRoutes(deps));
  api.use(analysesRoutes(deps));
  api.use(exportsRoutes(deps));
  api.use(apiNotFound);
  app.use('/api', api);

  serveClient(app, config.clientDist);
  app.use(errorHandler(log));
  return app;
}

/** Serves the built Angular app; unknown HTML requests outside /api get index.html. */
function serveClient(app: Express, dist: string): void {
  const index = join(dist, 'index.html');
  app.use(express.static(dist, { index: false, maxAge: '1h' }));
  app.get('/{*splat}', (req, res, next) => {
    if (req.path.startsWith('/api') || !req.accepts('html')) return next();
    if (!existsSync(index)) {
      res
        .status(503)
        .type('text')
        .send('The web client is not built yet. Run `npm start` (it builds first).');
      return;
    }
    res.set('Cache-Control', 'no-cache').sendFile(index);
  });
}
