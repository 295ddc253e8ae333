// Production entry point: config -> database -> listen -> graceful shutdown.
import { createServer } from 'node:http';
import type { Knex } from 'knex';
import { readFileSync } from 'node:fs';
import { createApp } from './app';
import { loadConfig, ConfigError } from './config/env';
import { createDb, migrateLatest } from './db/knex';
import { createLogger } from './lib/logger';
import { createMailService } from './modules/mail/mail.service';

export async function startServer(env: NodeJS.ProcessEnv = process.env) {
  const config = loadConfig(env);
  const logger = createLogger(config.LOG_LEVEL);
  const db = createDb(config.DATABASE_URL, { log: { warn: (m) => logger.warn(m) } });
  await migrateLatest(db);
  const version = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')).version as string;

  let clientDir: string | null | undefined;
  let vite: { middlewares: import('express').RequestHandler; close(): Promise<void> } | null = null;
  if (config.NODE_ENV === 'development') clientDir = null;
  // Started before listening: messages left queued by the last run go out, and the local fake
  // SMTP server (when no real one is configured) is ready for the first message.
  const mail = createMailService({ db, config, logger });
  try {
    await mail.start();
  } catch (err) {
    // The app still serves; messages stay in the outbox and the queue starts with the next one.
    logger.error({ err }, 'the mail queue could not start');
  }
  if (mail.fake) logger.info({ port: mail.fake.port }, 'no SMTP server configured: e-mails are kept by the local fake and shown on the admin outbox page');
  if (!config.PUBLIC_ORIGIN && config.NODE_ENV === 'production') {
    logger.warn('PUBLIC_ORIGIN is not set: links in e-mails use the host each request names; set it to the address people use');
  }
  const app = createApp({ db, config, logger, version, clientDir, mail });
  logger.info({ storage: app.locals.storage.kind, location: app.locals.storage.location }, 'uploads are stored here');
  if (config.NODE_ENV === 'development') {
    // Vite serves the client with hot reload in development; imported only here.
    const { createServer: createVite } = await import('vite');
    const v = await createVite({ server: { middlewareMode: true }, appType: 'spa' });
    vite = v;
    app.use(v.middlewares);
  }

  const server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.PORT, config.HOST, () => resolve());
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;
  logger.info({ port }, 'Beadpath listening');

  let stopping = false;
  async function shutdown(signal: string) {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down: finishing open requests');
    const timer = setTimeout(() => {
      logger.warn('open requests did not finish in 10 s; closing anyway');
      server.closeAllConnections();
    }, 10_000);
    server.closeIdleConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    clearTimeout(timer);
    await vite?.close();
    await app.locals.close();
    // A request whose client hung up is still finishing its work after the server has closed:
    // let its statements end rather than abort them under it (at most a few seconds).
    await poolDrained(db, 5_000);
    await db.destroy();
    logger.info('stopped');
  }
  return { server, port, config, shutdown, logger };
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  startServer()
    .then(({ shutdown }) => {
      for (const sig of ['SIGINT', 'SIGTERM'] as const) process.once(sig, () => void shutdown(sig).then(() => process.exit(0)));
    })
    .catch((err) => {
      console.error(err instanceof ConfigError ? err.message : err);
      process.exit(1);
    });
}

/** Resolves once no pooled connection is in use or awaited, or after `ms`. */
async function poolDrained(db: Knex, ms: number): Promise<void> {
  const pool = (db.client as { pool?: { numUsed(): number; numPendingAcquires(): number } }).pool;
  const until = Date.now() + ms;
  while (pool && pool.numUsed() + pool.numPendingAcquires() > 0 && Date.now() < until) await new Promise((r) => setTimeout(r, 25));
}
