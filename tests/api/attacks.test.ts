// Attacks tried against the running app: SQL injection in every query parameter, cross-site
// requests on every state-changing route, sign-in lock-outs that do not reveal accounts, path
// traversal in upload names and file routes, and a decompression bomb. Each gets a 4xx and changes nothing.
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { deflateSync } from 'node:zlib';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES } from '../../src/shared/permissions';
import * as articles from '../../src/shared/schemas/articles';
import * as auditSchemas from '../../src/shared/schemas/audit';
import * as assets from '../../src/shared/schemas/assets';
import * as cases from '../../src/shared/schemas/cases';
import * as guides from '../../src/shared/schemas/guides';
import * as insights from '../../src/shared/schemas/insights';
import * as search from '../../src/shared/schemas/search';
import * as walks from '../../src/shared/schemas/walks';
import { startTestApp, TEST_PASSWORD, type TestApp } from '../helpers/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let t: TestApp;
let everyone: Agent;

beforeAll(async () => {
  t = await startTestApp();
  everyone = (await t.signIn([...ROLES])).agent;
  // Some content so injected filters have rows to leak or destroy.
  await everyone.post('/api/sites').send({ name: 'Injection works' }).expect(201);
  await everyone.post('/api/cases').send({ callerName: 'Probe', site: 'Probe', symptom: 'Drips' }).expect(201);
});
afterAll(async () => t?.close());

/** A digest of every table's rows (sessions excepted: signing in writes them), to prove nothing changed. */
async function digest(): Promise<Record<string, string>> {
  const { rows: tables } = await t.db.raw(
    `select tablename from pg_tables where schemaname = 'public' and tablename not like 'knex_%' and tablename not in ('user_sessions', 'mail_messages', 'mail_captures', 'search_jobs', 'search_sync_state')`,
  );
  const parts = tables.map((r: { tablename: string }) => `select '${r.tablename}' as t, count(*)::int as n, md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as h from "${r.tablename}" x`);
  const { rows } = await t.db.raw(parts.join(' union all '));
  return Object.fromEntries(rows.map((r: { t: string; n: number; h: string }) => [r.t, `${r.n}:${r.h}`]));
}

/** Query schemas by name, from the shared modules the routes validate with. */
const schemas: Record<string, unknown> = { ...articles, ...auditSchemas, ...assets, ...cases, ...guides, ...insights, ...search, ...walks };
function keysOf(schema: unknown): string[] {
  const s = schema as { shape?: Record<string, unknown>; _zod?: { def?: { in?: { shape?: Record<string, unknown> }; schema?: { shape?: Record<string, unknown> } } } };
  return Object.keys(s.shape ?? s._zod?.def?.in?.shape ?? s._zod?.def?.schema?.shape ?? {});
}

/** Which query schema each GET route validates with, read from the route modules themselves. */
function queryParamsByRoute(): Map<string, string[]> {
  const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../server/modules');
  const map = new Map<string, string[]>();
  for (const dir of readdirSync(root)) {
    for (const file of readdirSync(join(root, dir)).filter((f) => f.endsWith('.routes.ts'))) {
      const text = readFileSync(join(root, dir, file), 'utf8');
      const bases = new Map([...text.matchAll(/const (\w+) = new ApiRouter\('([^']*)'\)/g)].map((m) => [m[1], m[2]]));
      for (const m of text.matchAll(/(\w+)\.get\(\s*'([^']*)'[^\n]*?validate\('query', (\w+)\)/g)) {
        const base = bases.get(m[1]);
        if (!base) continue;
        map.set(base + (m[2] === '/' ? '' : m[2]), keysOf(schemas[m[3]]));
      }
    }
  }
  return map;
}

const INJECTIONS = ["' OR '1'='1' --", '1; DROP TABLE users; --', "1' UNION SELECT email, password_hash FROM users --", "'); DELETE FROM sites; --", '\\%$1'];

describe('SQL injection', () => {
  it('when injection strings are sent in every query parameter of every GET route, then no answer is a 500, leaks a password hash, or changes a row', async () => {
    const params = queryParamsByRoute();
    expect(params.size, 'query-validated routes found in the route modules').toBeGreaterThan(8);
    expect([...params.values()].flat().length).toBeGreaterThan(15);
    // First reads create an organisation's default lists; do that before taking the digest.
    for (const r of t.app.locals.routeTable) if (r.method === 'get' && !r.path.includes(':')) await everyone.get(r.path);
    const before = await digest();
    const hashes: string[] = (await t.db('users').select('password_hash')).map((r: { password_hash: string }) => r.password_hash).filter(Boolean);
    const problems: string[] = [];
    let sent = 0;
    for (const r of t.app.locals.routeTable) {
      if (r.method !== 'get') continue;
      const path = r.path
        .replace(/:token/g, 'x'.repeat(32))
        .replace(/:id|:readingId|:eventId|:number/g, '1')
        .replace(/:kind/g, 'sites')
        .replace(/:variant/g, 'display');
      // Every route gets the common names too, in case a handler reads a parameter it does not validate.
      const names = new Set([...(params.get(r.path) ?? []), 'q']);
      for (const name of names) {
        for (const value of INJECTIONS) {
          const res = await everyone.get(path).query({ [name]: value });
          sent++;
          const text = res.text ?? '';
          if (res.status >= 500) problems.push(`${r.path}?${name}=${value} -> ${res.status}`);
          if (hashes.some((h) => text.includes(h))) problems.push(`${r.path}?${name}=${value} leaked a password hash`);
        }
      }
    }
    expect(problems).toEqual([]);
    expect(sent).toBeGreaterThan(300);
    expect(await digest()).toEqual(before);
    expect((await everyone.get('/api/sites')).body.sites.length).toBe(1);
  }, 40_000);

  it('when injection strings are searched for, then search answers normally and finds nothing', async () => {
    for (const q of INJECTIONS) {
      const res = await everyone.get('/api/search').query({ q });
      expect(res.status, q).toBeLessThan(500);
      if (res.status === 200) expect(res.body.total, q).toBe(0);
    }
  });
});

describe('cross-site request forgery', () => {
  it('when every state-changing route is called from a foreign Origin or a foreign Referer, then it is refused with 403 and nothing changes', async () => {
    const before = await digest();
    const problems: string[] = [];
    let tried = 0;
    for (const r of t.app.locals.routeTable) {
      if (r.method === 'get') continue;
      const path = r.path
        .replace(/:token/g, 'x'.repeat(32))
        .replace(/:id|:readingId|:eventId|:number/g, '1')
        .replace(/:kind/g, 'sites')
        .replace(/:[a-zA-Z]+/g, 'sample');
      for (const header of [{ Origin: 'https://evil.example.net' }, { Origin: 'null', Referer: 'https://evil.example.net/page' }]) {
        const res = await everyone[r.method](path)
          .set(header)
          .send({ name: 'Forged', email: 'forged@example.com', password: TEST_PASSWORD, roles: ['admin'] });
        tried++;
        if (res.status !== 403 || res.body?.error?.code !== 'forbidden') problems.push(`${r.method.toUpperCase()} ${r.path} with ${JSON.stringify(header)} -> ${res.status}`);
      }
    }
    expect(problems).toEqual([]);
    expect(tried).toBeGreaterThan(50);
    expect(await digest()).toEqual(before);
    // The session still works: a refused forgery does not sign the victim out.
    expect((await everyone.get('/api/auth/me')).body.user).toBeTruthy();
  }, 20_000);
});

describe('brute force on sign-in', () => {
  it('when an existing and an unknown address are both guessed past the limit, then both are locked with the same answer', async () => {
    const limited = await startTestApp({ LOGIN_RATE_LIMIT: '3' });
    try {
      const real = await limited.createUser(['technician']);
      const answers: { status: number; body: unknown }[] = [];
      for (const email of [real.email, 'nobody-here@example.com']) {
        for (let i = 0; i < 3; i++)
          expect(
            (
              await limited
                .agent()
                .post('/api/auth/login')
                .send({ email, password: `guess ${i}` })
            ).status,
          ).toBe(401);
        const res = await limited.agent().post('/api/auth/login').send({ email, password: TEST_PASSWORD });
        answers.push({ status: res.status, body: { ...res.body.error, requestId: undefined } });
      }
      expect(answers[0].status).toBe(429);
      expect(answers[1]).toEqual(answers[0]);
    } finally {
      await limited.close();
    }
  });
});

function filesOutside(dir: string): number {
  // The parent of the files folder is the temp folder other tests share; count only what could be ours.
  const parent = dirname(dir);
  return readdirSync(parent).filter((n) => /passwd|etc/i.test(n)).length;
}

describe('path traversal', () => {
  it('when an upload is named to climb out of the files folder, then nothing is written outside it and the name is stored flat', async () => {
    const filesDir = t.app.locals.filesDir;
    const outsideBefore = filesOutside(filesDir);
    const passwdBefore = existsSync('/etc/passwd') ? statSync('/etc/passwd').mtimeMs : 0;
    const png = await sharp({ create: { width: 8, height: 8, channels: 3, background: { r: 1, g: 2, b: 3 } } })
      .png()
      .toBuffer();
    const res = await everyone.post('/api/files').attach('file', png, '../../etc/passwd.png');
    if (res.status === 201) {
      expect(res.body.file.originalName).not.toMatch(/[/\\]/);
      const row = await t.db('files').where({ id: res.body.file.id }).first();
      for (const v of Object.values(row.variants as Record<string, { key: string }>)) expect(resolve(filesDir, v.key).startsWith(resolve(filesDir) + '/')).toBe(true);
    } else {
      expect(res.status).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
    }
    expect(filesOutside(filesDir)).toBe(outsideBefore);
    if (passwdBefore) expect(statSync('/etc/passwd').mtimeMs).toBe(passwdBefore);
  });

  it('when a file route is asked for a path that climbs out, then it answers 4xx and no bytes of the system file', async () => {
    for (const path of ['/api/files/..%2f..%2fetc/passwd/display', '/api/files/..%2F..%2F..%2Fetc%2Fpasswd/original', '/api/files/%2e%2e/%2e%2e/original', '/api/files/....//....//etc/passwd']) {
      const res = await everyone.get(path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(res.status, path).toBeLessThan(500);
      expect(res.text ?? '', path).not.toContain('root:');
    }
  });
});

function crc32(buf: Buffer): number {
  let c = ~0;
  for (const byte of buf) {
    c ^= byte;
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
  }
  return ~c >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}

/** A valid-looking PNG of a few hundred bytes whose header declares width x height pixels. */
function bombPng(width: number, height: number): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([8, 2, 0, 0, 0], 8); // 8-bit RGB, no interlace
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.alloc(width * 3 + 1 > 4096 ? 4096 : width * 3 + 1))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

describe('decompression bomb', () => {
  it('when a tiny PNG declares 50,000 x 50,000 pixels, then the upload is refused with a clear 4xx quickly and nothing is stored', async () => {
    const bomb = bombPng(50_000, 50_000);
    expect(bomb.length).toBeLessThan(1000);
    const rowsBefore = (await t.db('files').count({ n: '*' }))[0].n;
    const started = Date.now();
    const res = await everyone.post('/api/files').attach('file', bomb, 'huge.png');
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(res.body.error.message).toMatch(/50000 × 50000 pixels/);
    expect(Date.now() - started).toBeLessThan(5000);
    expect((await t.db('files').count({ n: '*' }))[0].n).toBe(rowsBefore);
  });
});
