// Two Beadpath servers on one database, as behind a load balancer: sessions, walks and answers
// live in PostgreSQL, so a technician can go back and forth between them and nothing is kept twice.
import { randomBytes, randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp, type BeadpathApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createDb, type Db } from '../../server/db/knex';
import { createLogger } from '../../server/lib/logger';
import { publishSampleGuide } from '../helpers/guides';
import { startTestApp, TEST_PASSWORD, type TestApp } from '../helpers/test-app';

const SECRET = randomBytes(32).toString('hex');
let a: TestApp;
let b: { url: string; server: Server; app: BeadpathApp; db: Db };
let guideId: number;

/** A second app process's worth of state (own pools, own session store, own memory) on A's database. */
async function secondServer(dbUrl: string) {
  const db = createDb(dbUrl, { max: 5 });
  const config = loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: dbUrl,
    SESSION_SECRET: SECRET,
    LOG_LEVEL: 'silent',
    FILES_DIR: mkdtempSync(join(tmpdir(), 'beadpath-files-b-')),
    FAKE_SMTP: '1',
    MAIL_POLL_S: '0.5',
  });
  const app = createApp({ db, config, logger: createLogger('silent'), clientDir: null, version: 'test-b' });
  const server = createServer(app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  return { url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, server, app, db };
}

beforeAll(async () => {
  a = await startTestApp({ SESSION_SECRET: SECRET });
  b = await secondServer(a.dbUrl);
  guideId = await publishSampleGuide(a.db, a.organisationId);
});
afterAll(async () => {
  if (b) {
    b.server.closeAllConnections();
    await new Promise<void>((r) => b.server.close(() => r()));
    await b.app.locals.close();
    await b.db.destroy();
  }
  await a?.close();
});

/** Signs a new technician in on server A and returns the session cookie a browser would keep. */
async function cookieFromA(): Promise<string> {
  const user = await a.createUser(['technician']);
  const res = await request(a.url).post('/api/auth/login').set('Origin', a.url).send({ email: user.email, password: TEST_PASSWORD });
  expect(res.status).toBe(200);
  return (res.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; ');
}

// Behind a load balancer both servers answer on one address; here each request names the server it went to.
const on = (server: { url: string }, cookie: string) => ({
  get: (path: string) => request(server.url).get(path).set('Cookie', cookie),
  post: (path: string, body?: object) => request(server.url).post(path).set('Origin', server.url).set('Cookie', cookie).send(body),
});

const entry = (stepId: string, rest: Record<string, unknown>) => ({ id: `s-${randomUUID()}`, answeredAt: new Date().toISOString(), stepId, ...rest });

describe('two servers on one database', () => {
  it('when a walk is started and answered on one server, then the other continues it with the same cookie, and signing out on one ends the session on both', async () => {
    const cookie = await cookieFromA();
    const started = await on(a, cookie).post('/api/walks', { guideId });
    expect(started.status).toBe(201);
    const walkId = started.body.walk.id as number;
    const first = entry('drip-when', { kind: 'choice', choiceId: 'after-each-shot' });
    expect((await on(a, cookie).post(`/api/walks/${walkId}/answers`, first)).status).toBe(201);

    const onB = await on(b, cookie).get(`/api/walks/${walkId}`);
    expect(onB.status).toBe(200);
    expect(onB.body.walk.answers.map((x: { id: string }) => x.id)).toEqual([first.id]);
    expect(onB.body.walk.state.at).toBe('fluid-pressure');

    const second = entry('fluid-pressure', { kind: 'reading', value: 4, unit: 'bar' });
    const answeredOnB = await on(b, cookie).post(`/api/walks/${walkId}/answers`, second);
    expect(answeredOnB.status).toBe(201);
    expect(answeredOnB.body.walk.answerCount).toBe(2);
    const onA = await on(a, cookie).get(`/api/walks/${walkId}`);
    expect(onA.body.walk.answers.map((x: { id: string }) => x.id)).toEqual([first.id, second.id]);
    expect(onA.body.walk.state.at).toBe('purge-air');

    expect((await on(a, cookie).post('/api/auth/logout')).status).toBe(204);
    expect((await on(b, cookie).get('/api/auth/me')).body.user).toBeNull();
    expect((await on(b, cookie).get(`/api/walks/${walkId}`)).status).toBe(401);
  });

  it('when the device sends the same answer to both servers at once, then it is stored once and both say it is saved', async () => {
    const cookie = await cookieFromA();
    const walkId = (await on(b, cookie).post('/api/walks', { guideId })).body.walk.id as number;
    const same = entry('drip-when', { kind: 'choice', choiceId: 'between-shots' });
    const replies = await Promise.all([a, b, a, b].map((server) => on(server, cookie).post(`/api/walks/${walkId}/answers`, same)));
    expect(replies.map((r) => r.status).sort()).toEqual([200, 200, 200, 201]);
    expect(replies.filter((r) => r.body.duplicate === false)).toHaveLength(1);
    expect(await a.db('walk_answers').where({ walk_id: walkId }).count('* as n').first()).toMatchObject({ n: '1' });
  });

  it('when two different answers to one step race on the two servers, then exactly one is stored and the other is refused as a conflict', async () => {
    const cookie = await cookieFromA();
    const walkId = (await on(a, cookie).post('/api/walks', { guideId })).body.walk.id as number;
    const choices = ['after-each-shot', 'between-shots', 'after-stop', 'after-each-shot', 'between-shots', 'after-stop'];
    const replies = await Promise.all(choices.map((choiceId, i) => on(i % 2 ? b : a, cookie).post(`/api/walks/${walkId}/answers`, entry('drip-when', { kind: 'choice', choiceId }))));
    expect(replies.filter((r) => r.status === 201)).toHaveLength(1);
    for (const r of replies.filter((x) => x.status !== 201)) {
      expect(r.status).toBe(409);
      expect(r.body.error.details.reason).toMatch(/already-answered|not-current|not-on-path/);
    }
    const rows = await a.db('walk_answers').where({ walk_id: walkId }).select('seq');
    expect(rows.map((r) => r.seq)).toEqual([1]);
    expect((await a.db('walks').where({ id: walkId }).first('answer_count')).answer_count).toBe(1);
  });
});
