// Builds the Express application from its dependencies; listening is index.ts's job, so tests
// can drive the same app in-process.
import compression from 'compression';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type { Knex } from 'knex';
import pg from 'pg';
import type { Logger } from 'pino';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Config } from './config/env';
import { loadClientShell } from './lib/client-shell';
import { sameOriginGuard } from './lib/csrf';
import { apiNotFound, errorHandler } from './lib/error-handler';
import { httpLogger } from './lib/logger';
import type { ApiRouter, RouteInfo } from './lib/routes';
import { adminRoutes } from './modules/admin/admin.routes';
import { createAdminService } from './modules/admin/admin.service';
import { authRoutes, configurePassport } from './modules/auth/auth.routes';
import { createAuthService } from './modules/auth/auth.service';
import { createSessionStore } from './modules/auth/session-store';
import { calculatorRoutes } from './modules/calculators/calculators.routes';
import { floorRoutes, healthRoutes } from './modules/health/health.routes';
import { settingsRoutes } from './modules/admin/settings.routes';
import { auditRoutes } from './modules/admin/audit.routes';
import { articlesRoutes } from './modules/articles/articles.routes';
import { createArticlesService } from './modules/articles/articles.service';
import { filesRoutes } from './modules/files/files.routes';
import { createFilesService } from './modules/files/files.service';
import { adminTagsRoutes, tagsRoutes } from './modules/tags/tags.routes';
import { createTagsService } from './modules/tags/tags.service';
import { storageFor, type FileStorage } from './lib/storage';
import { guidesRoutes } from './modules/guides/guides.routes';
import { walksRoutes } from './modules/walks/walks.routes';
import { searchRoutes, stopSearch } from './modules/search/search.routes';
import { assetsRoutes } from './modules/assets/assets.routes';
import { casesRoutes } from './modules/cases/cases.routes';
import { createInsightsModule } from './modules/insights/insights.routes';
import { createMailService, type MailService } from './modules/mail/mail.service';

export interface AppDeps {
  db: Knex;
  config: Config;
  logger: Logger;
  version?: string;
  /** Folder of the built client; served with a single-page fallback when it exists. */
  clientDir?: string | null;
  /** Outgoing mail; by default one that starts its queue (and the local fake SMTP) on first use. */
  mail?: MailService;
  /** Where upload bytes go; by default the configured one (S3 when S3_BUCKET is set, else the FILES_DIR folder). */
  storage?: FileStorage;
}

export interface BeadpathApp extends Express {
  locals: Express['locals'] & { routeTable: RouteInfo[]; filesDir: string; storage: FileStorage; mail: MailService; close: () => Promise<void> };
}

/** The session cookie's name. */
export const SESSION_COOKIE = 'beadpath.sid';
const hasSessionCookie = (header: string | undefined) => Boolean(header && header.split(';').some((c) => c.trim().startsWith(`${SESSION_COOKIE}=`)));

export const defaultClientDir = fileURLToPath(new URL('../dist', import.meta.url));
export const defaultFilesDir = fileURLToPath(new URL('../.data/files', import.meta.url));

/**
 * Rolling sessions would write the session row on every request; extending the expiry at most
 * every few minutes per session saves a database round trip on almost every call.
 */
function throttleTouch(store: session.Store, everyMs: number) {
  const original = store.touch?.bind(store);
  if (!original) return;
  const last = new Map<string, number>();
  store.touch = (sid, sess, callback) => {
    const now = Date.now();
    if (now - (last.get(sid) ?? 0) < everyMs) return callback?.();
    last.set(sid, now);
    if (last.size > 50_000) last.clear();
    original(sid, sess, callback);
  };
}

export function createApp(deps: AppDeps): BeadpathApp {
  const { db, config, logger } = deps;
  const app = express() as unknown as BeadpathApp;
  app.disable('x-powered-by');
  app.set('trust proxy', config.TRUST_PROXY ? 1 : false);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          'style-src': ["'self'", "'unsafe-inline'"],
          'font-src': ["'self'", 'data:'],
          'img-src': ["'self'", 'data:', 'blob:'],
          'connect-src': ["'self'"],
          // The offline service worker and the install manifest, both served from dist/.
          'worker-src': ["'self'"],
          'manifest-src': ["'self'"],
          'frame-ancestors': ["'none'"],
          'upgrade-insecure-requests': null,
        },
      },
    }),
  );
  app.use(httpLogger(logger));
  // Phones on weak signal: the client and JSON answers go gzip-compressed.
  app.use(compression());

  const sessionPool = new pg.Pool({ connectionString: config.DATABASE_URL, max: 4 });
  sessionPool.on('error', (err) => logger.warn({ err }, 'session store connection lost'));
  const sessions = createSessionStore(sessionPool, logger);
  const store = sessions.store;
  throttleTouch(store, 5 * 60 * 1000);

  const mail = deps.mail ?? createMailService({ db, config, logger });
  const auth = createAuthService(db, { mail, config });
  const tags = createTagsService(db);
  const filesDir = config.FILES_DIR ?? defaultFilesDir;
  const storage = deps.storage ?? storageFor(config, defaultFilesDir);
  const files = createFilesService(db, storage, logger);
  const passport = configurePassport(auth, sessions);
  const api = express.Router();
  api.use(express.json({ limit: config.JSON_BODY_LIMIT }));
  api.use(sameOriginGuard(config.PUBLIC_ORIGIN));
  api.use(
    session({
      name: SESSION_COOKIE,
      secret: config.SESSION_SECRET,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: 7 * 24 * 3600 * 1000 },
    }),
  );
  api.use(passport.initialize());
  api.use(passport.session());

  // Health answers before sessions are read, so it reports the database even when sessions cannot load.
  const health = healthRoutes({ db, version: deps.version ?? 'dev' });
  app.use(health.base, health.router);
  // Insights summaries refresh through pg-boss jobs; started here except under tests, which start them when they need them.
  const insights = createInsightsModule({ db, config, logger, mail });
  if (config.NODE_ENV !== 'test') void insights.jobs.start().catch((err) => logger.error({ err }, 'the insights jobs could not start'));
  const routers: ApiRouter[] = [
    health,
    authRoutes({ auth, passport, loginLimit: config.LOGIN_RATE_LIMIT, resetLimit: config.RESET_RATE_LIMIT }),
    adminRoutes({ admin: createAdminService(db, { mail, config }) }),
    settingsRoutes({ db }),
    auditRoutes({ db }),
    floorRoutes({ db }),
    calculatorRoutes(),
    tagsRoutes({ tags }),
    adminTagsRoutes({ tags }),
    filesRoutes({ files, limitMb: config.UPLOAD_LIMIT_MB }),
    articlesRoutes({ articles: createArticlesService({ db, tags, files }) }),
    ...guidesRoutes({ db, tags, files }),
    ...walksRoutes({ db, files }),
    ...searchRoutes({ db, config, logger }),
    ...assetsRoutes({ db, files }),
    ...casesRoutes({ db, config, logger, files, mail }),
    ...insights.routers,
  ];
  app.use('/api', api);
  for (const r of routers) if (r !== health) app.use(r.base, r.router);
  app.use('/api', apiNotFound);
  app.use('/api', errorHandler);

  const clientDir = deps.clientDir === undefined ? defaultClientDir : deps.clientDir;
  if (clientDir && existsSync(join(clientDir, 'index.html'))) {
    app.use('/assets', express.static(join(clientDir, 'assets'), { immutable: true, maxAge: '365d', index: false }));
    // A hashed file from an older build is gone: a 404, never index.html, which a browser would try
    // to run as a script and the offline worker would keep as that file.
    app.use('/assets', (_req, res) => {
      res.setHeader('Cache-Control', 'no-store');
      res.status(404).type('text/plain').send('Not found');
    });
    app.use(
      express.static(clientDir, {
        index: false,
        maxAge: '1h',
        // The offline worker and the manifest decide what a phone keeps: always checked for a new build.
        setHeaders: (res, path) => {
          if (/[\\/](sw\.js|workbox-[^\\/]*\.js|manifest\.webmanifest)$/.test(path)) res.setHeader('Cache-Control', 'no-cache');
        },
      }),
    );
    const shell = loadClientShell(clientDir);
    app.get('/{*splat}', (req, res) => {
      // The page differs with the address and with the session cookie's presence (its hints).
      res.setHeader('Cache-Control', 'no-cache, private');
      res.type('html').send(shell.html(req.path, hasSessionCookie(req.headers.cookie)));
    });
  }

  app.locals.routeTable = routers.flatMap((r) => r.routes);
  app.locals.filesDir = filesDir;
  app.locals.storage = storage;
  app.locals.mail = mail;
  app.locals.insights = insights;
  app.locals.close = async () => {
    await insights.jobs.stop();
    // Messages still waiting stay in the outbox; the next start sends them.
    await mail.stop();
    await stopSearch(db);
    await new Promise<void>((resolve) => (store.close ? (store.close(), resolve()) : resolve()));
    await sessionPool.end().catch(() => {});
  };
  return app;
}
