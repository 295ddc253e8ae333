// Browser tests' global setup: the built client served by the real server over a demo-seeded
// database cloned from the template, on a free port.
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomBytes } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import type { TestProject } from 'vitest/node';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createDb } from '../../server/db/knex';
import { runSeeds } from '../../server/db/seed';
import { createLogger } from '../../server/lib/logger';
import { buildClientIfStale } from '../../scripts/lib/build-client';
import { prepareTemplate } from './global-db';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    browserDbUrl: string;
  }
}

export default async function setup(project: TestProject) {
  await buildClientIfStale(() => {});
  const { pgAdminUrl: adminUrl, pgUrlPrefix: prefix, pgTemplate: template } = await prepareTemplate(project.name);
  project.provide('pgAdminUrl', adminUrl);
  project.provide('pgUrlPrefix', prefix);
  project.provide('pgTemplate', template);
  const name = `browser_${randomBytes(4).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  await admin.query(`create database "${name}" template "${template}"`);
  await admin.end();
  const dbUrl = prefix + name;

  const db = createDb(dbUrl, { max: 6 });
  process.env.BEADPATH_DEMO = '1';
  // The seeds store the demo drawings where the server will read them.
  const filesDir = mkdtempSync(join(tmpdir(), 'beadpath-files-'));
  process.env.FILES_DIR = filesDir;
  await runSeeds(db);
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: dbUrl, SESSION_SECRET: randomBytes(32).toString('hex'), LOG_LEVEL: 'silent', LOGIN_RATE_LIMIT: '50', FILES_DIR: filesDir });
  const app = createApp({ db, config, logger: createLogger('silent') });
  const server = createServer(app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  project.provide('baseUrl', baseUrl);
  project.provide('browserDbUrl', dbUrl);

  return async () => {
    server.closeAllConnections();
    await new Promise<void>((r) => server.close(() => r()));
    await app.locals.close();
    await db.destroy();
    const a = new pg.Client({ connectionString: adminUrl });
    await a.connect();
    await a.query(`drop database if exists "${name}" with (force)`);
    await a.end();
  };
}
