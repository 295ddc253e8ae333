// The real app on a real port over its own database, and helpers to make users and sign them in.
import type { AddressInfo } from 'node:net';
import { createServer, type Server } from 'node:http';
import { randomBytes } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import type { Role } from '../../src/shared/permissions';
import { createApp, type BeadpathApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import type { Db } from '../../server/db/knex';
import { createLogger } from '../../server/lib/logger';
import { hashPassword } from '../../server/lib/passwords';
import { createTestDatabase } from './database';
import { createDb } from '../../server/db/knex';
import { startTcpProxy, type TcpProxy } from './tcp-proxy';
import type { MailService } from '../../server/modules/mail/mail.service';
import type { FileStorage } from '../../server/lib/storage';
import type { CapturedMail } from '../../server/modules/mail/fake-smtp';

export const TEST_PASSWORD = 'correct horse battery staple';

export interface TestApp {
  app: BeadpathApp;
  db: Db;
  dbUrl: string;
  url: string;
  server: Server;
  organisationId: number;
  /** A request agent that sends our Origin, as a Beadpath page would. */
  agent: () => ReturnType<typeof request.agent>;
  createUser: (roles: Role[], extra?: { email?: string; active?: boolean; password?: string | null }) => Promise<{ id: number; email: string }>;
  signIn: (roles: Role[]) => Promise<{ agent: ReturnType<typeof request.agent>; user: { id: number; email: string } }>;
  close: () => Promise<void>;
  proxy?: TcpProxy;
  /** The app's mail service; its local fake SMTP server keeps every message in this test's database. */
  mail: MailService;
  /** Waits until the fake SMTP server has received a message that matches, and returns it. */
  waitForMail: (match: (m: CapturedMail) => boolean, timeoutMs?: number) => Promise<CapturedMail>;
}

let passwordHash: Promise<string> | null = null;

export async function startTestApp(env: Record<string, string> = {}, opts: { viaProxy?: boolean; storage?: FileStorage } = {}): Promise<TestApp> {
  const created = await createTestDatabase();
  const { drop } = created;
  let { db, url: dbUrl } = created;
  let proxy: TcpProxy | undefined;
  if (opts.viaProxy) {
    // The app reaches PostgreSQL through a relay the test can cut.
    const target = new URL(dbUrl);
    proxy = await startTcpProxy(target.hostname, Number(target.port));
    target.port = String(proxy.port);
    dbUrl = target.toString();
    db = createDb(dbUrl, { max: 5 });
  }
  const config = loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: dbUrl,
    SESSION_SECRET: randomBytes(32).toString('hex'),
    LOG_LEVEL: 'silent',
    LOGIN_RATE_LIMIT: '1000',
    FILES_DIR: mkdtempSync(join(tmpdir(), 'beadpath-files-')),
    // Mail goes to a local fake per app, polled and retried quickly so tests take seconds.
    FAKE_SMTP: '1',
    MAIL_POLL_S: '0.5',
    MAIL_RETRY_DELAY_S: '1',
    MAIL_RETRY_BACKOFF: '0',
    MAIL_RETRY_LIMIT: '3',
    RESET_RATE_LIMIT: '1000',
    ...env,
  });
  const app = createApp({ db, config, logger: createLogger('silent'), clientDir: null, version: 'test', storage: opts.storage });
  const server = createServer(app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const [org] = await db('organisations').insert({ name: 'Test works' }).returning('id');
  const organisationId = org.id as number;
  passwordHash ??= hashPassword(TEST_PASSWORD);

  const agent = () => request.agent(url).set('Origin', url);

  const createUser: TestApp['createUser'] = async (roles, extra = {}) => {
    const email = extra.email ?? `${roles.join('-')}-${randomBytes(4).toString('hex')}@example.com`;
    const [row] = await db('users')
      .insert({
        organisation_id: organisationId,
        email,
        name: `Test ${roles.join(' ')}`,
        roles,
        active: extra.active ?? true,
        password_hash: extra.password === null ? null : extra.password ? await hashPassword(extra.password) : await passwordHash,
      })
      .returning('id');
    return { id: row.id as number, email };
  };

  const signIn: TestApp['signIn'] = async (roles) => {
    const user = await createUser(roles);
    const a = agent();
    const res = await a.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
    return { agent: a, user };
  };

  const waitForMail: TestApp['waitForMail'] = async (match, timeoutMs = 10_000) => {
    const fake = app.locals.mail.fake;
    if (!fake) throw new Error('this test app sends through a real SMTP server, not the fake');
    const until = Date.now() + timeoutMs;
    for (;;) {
      const found = (await fake.captured()).find(match);
      if (found) return found;
      if (Date.now() > until) throw new Error(`no matching message reached the fake SMTP server in ${timeoutMs} ms`);
      await new Promise((r) => setTimeout(r, 100));
    }
  };

  return {
    app,
    db,
    mail: app.locals.mail,
    waitForMail,
    dbUrl,
    url,
    server,
    organisationId,
    agent,
    createUser,
    signIn,
    proxy,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
      await app.locals.close();
      if (proxy) {
        await db.destroy();
        await proxy.close();
      }
      await drop();
    },
  };
}
