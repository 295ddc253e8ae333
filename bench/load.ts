// `npm run bench:load`: simulated technicians on loopback (autocannon), each signing in, starting a
// walk on the sample guide, answering its first step, leaving the walk and searching, over and over.
// Proves zero failed requests and that every acknowledged answer is in the database; prints p95 per
// route and throughput against two floors (a signed-in no-op and a signed-in one-query route).
// Env: BENCH_TECHS (default 50), BENCH_SECONDS (default 20). Uses its own database in the test cluster.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes, randomUUID } from 'node:crypto';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import autocannon from 'autocannon';
import { register } from 'tsx/esm/api';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../src/shared/guides/sample';
import { createDb, migrateLatest } from '../server/db/knex';
import { hashPassword } from '../server/lib/passwords';
import { dropDatabase, ensureCluster, ensureDatabase } from '../scripts/lib/cluster';

register();
const TECHS = Number(process.env.BENCH_TECHS ?? 50);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 20);
const PASSWORD = 'bench-password-not-secret';
const root = resolve(import.meta.dirname, '..');

const freePort = () =>
  new Promise<number>((done) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => done(port));
    });
  });

const pct = (xs: number[], p: number) => {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))];
};

async function startApp(dbUrl: string) {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'server/index.ts')], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: dbUrl, SESSION_SECRET: randomBytes(32).toString('hex'), PORT: String(port), HOST: '127.0.0.1', LOG_LEVEL: 'warn', NODE_ENV: 'production', MEILI_URL: '', MEILI_API_KEY: '', LOGIN_RATE_LIMIT: '100000' },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 300; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) return { child, base };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  child.kill();
  throw new Error('the app did not start within 30 s');
}

async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: base }, body: JSON.stringify({ email, password: PASSWORD }) });
  if (!res.ok) throw new Error(`sign-in failed for ${email}: ${res.status}`);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

/** A valid answer at the walk's current step: acknowledge its cautions if any, else take its first choice. */
function firstAnswer(ctx: Ctx): Record<string, unknown> {
  if (ctx.cautions?.length) return { stepId: ctx.stepId, kind: 'acknowledge', cautionIds: ctx.cautions };
  const step = SAMPLE_GUIDE.steps.find((x) => x.id === ctx.stepId) as { choices?: { id: string }[] } | undefined;
  return { stepId: ctx.stepId, kind: 'choice', choiceId: step?.choices?.[0]?.id };
}

type Ctx = { cookie?: string; walkId?: number; stepId?: string; cautions?: string[]; sentAt?: number; label?: string; answerId?: string };

async function floor(base: string, cookies: string[], path: string) {
  let i = 0;
  const times: number[] = [];
  const inst = autocannon({ url: base, connections: TECHS, duration: Math.max(5, Math.round(SECONDS / 3)), requests: [{ method: 'GET', path, setupRequest: (req: any, ctx: Ctx) => ((ctx.cookie ??= cookies[i++ % cookies.length]), { ...req, headers: { ...req.headers, cookie: ctx.cookie } }) }] } as any);
  inst.on('response', (_c: unknown, _s: number, _b: number, t: number) => times.push(t));
  const r: any = await inst;
  return { rps: r.requests.average as number, p95: pct(times, 95), failed: r.non2xx + r.errors + r.timeouts };
}

async function main() {
  const cluster = await ensureCluster({ name: 'pg-test', durable: false, log: () => {} });
  const dbName = `bench_load_${randomBytes(4).toString('hex')}`;
  ensureDatabase(cluster, dbName);
  const dbUrl = cluster.urlFor(dbName);
  const db = createDb(dbUrl, { max: 4 });
  let app: ChildProcess | null = null;
  try {
    await migrateLatest(db);
    const [org] = await db('organisations').insert({ name: 'Load works' }).returning('id');
    const hash = await hashPassword(PASSWORD);
    const emails = Array.from({ length: TECHS }, (_, i) => `tech${i}@load.invalid`);
    await db('users').insert(emails.map((email, i) => ({ organisation_id: org.id, email, name: `Technician ${i}`, roles: ['technician'], password_hash: hash })));
    const [guide] = await db('guides').insert({ organisation_id: org.id, status: 'active' }).returning('id');
    const [version] = await db('guide_versions')
      .insert({ guide_id: guide.id, number: 1, state: 'published', title: SAMPLE_GUIDE_META.title, symptom: SAMPLE_GUIDE_META.symptom, summary: SAMPLE_GUIDE_META.summary ?? '', tags: SAMPLE_GUIDE_META.tags, content: JSON.stringify(SAMPLE_GUIDE), published_at: db.fn.now() })
      .returning('id');
    await db('guides').where({ id: guide.id }).update({ published_version_id: version.id });

    const started = await startApp(dbUrl);
    app = started.child;
    const { base } = started;
    let t0 = performance.now();
    const cookies = await Promise.all(emails.map((e) => signIn(base, e)));
    const signInMs = performance.now() - t0;

    const times: Record<string, number[]> = { 'POST /api/walks': [], 'POST /api/walks/:id/answers': [], 'POST /api/walks/:id/abandon': [], 'GET /api/search': [] };
    const acknowledgedIds = new Set<string>();
    let failures = 0;
    let next = 0;
    const json = { 'content-type': 'application/json', origin: base };
    const timed = (label: string) => (status: number, body: string, ctx: Ctx) => {
      times[label].push(performance.now() - (ctx.sentAt ?? 0));
      if (status >= 300) {
        failures++;
        if (failures < 5) console.error(`${label} -> ${status} ${body.slice(0, 200)}`);
      }
      return JSON.parse(body || '{}');
    };
    const stamp = (ctx: Ctx, req: any, extra: object) => {
      ctx.cookie ??= cookies[next++ % cookies.length];
      ctx.sentAt = performance.now();
      return { ...req, ...extra, headers: { ...json, cookie: ctx.cookie } };
    };
    t0 = performance.now();
    const mixed: any = await autocannon({
      url: base,
      connections: TECHS,
      duration: SECONDS,
      requests: [
        {
          method: 'POST',
          path: '/api/walks',
          setupRequest: (req: any, ctx: Ctx) => stamp(ctx, req, { body: JSON.stringify({ guideId: guide.id, site: 'Load plant' }) }),
          onResponse: (s: number, b: string, ctx: Ctx) => {
            const out = timed('POST /api/walks')(s, b, ctx);
            ctx.walkId = out.walk?.id;
            ctx.stepId = out.walk?.state?.at;
            ctx.cautions = out.walk?.state?.unacknowledged ?? [];
          },
        },
        {
          method: 'POST',
          setupRequest: (req: any, ctx: Ctx) =>
            stamp(ctx, req, { path: `/api/walks/${ctx.walkId}/answers`, body: JSON.stringify({ id: (ctx.answerId = `ans-${randomUUID()}`), answeredAt: new Date().toISOString(), ...firstAnswer(ctx) }) }),
          onResponse: (s: number, b: string, ctx: Ctx) => {
            const out = timed('POST /api/walks/:id/answers')(s, b, ctx);
            if (s === 201 && out.duplicate === false) acknowledgedIds.add(ctx.answerId!);
          },
        },
        {
          method: 'POST',
          setupRequest: (req: any, ctx: Ctx) => stamp(ctx, req, { path: `/api/walks/${ctx.walkId}/abandon`, body: JSON.stringify({ reason: 'Load run' }) }),
          onResponse: (s: number, b: string, ctx: Ctx) => void timed('POST /api/walks/:id/abandon')(s, b, ctx),
        },
        {
          method: 'GET',
          path: '/api/search?q=drip%20seat',
          setupRequest: (req: any, ctx: Ctx) => stamp(ctx, req, {}),
          onResponse: (s: number, b: string, ctx: Ctx) => void timed('GET /api/search')(s, b, ctx),
        },
      ],
    } as any);
    const mixedSeconds = (performance.now() - t0) / 1000;
    // Answers still in flight when the run stops are stored but never acknowledged; what matters is
    // that every acknowledged one is there exactly once, and nothing is stored twice.
    const stored = Number((await db('walk_answers').count('* as n'))[0].n);
    const ids = [...acknowledgedIds];
    let found = 0;
    for (let i = 0; i < ids.length; i += 5000) found += Number((await db('walk_answers').whereIn('client_id', ids.slice(i, i + 5000)).count('* as n'))[0].n);
    const duplicates = Number((await db.raw('select count(*)::int as n from (select client_id from walk_answers group by client_id having count(*) > 1) d')).rows[0].n);

    const noop = await floor(base, cookies, '/api/health/floor/noop');
    const query = await floor(base, cookies, '/api/health/floor/query');

    const failed = mixed.non2xx + mixed.errors + mixed.timeouts + failures;
    console.log(`\n${TECHS} technicians, ${SECONDS} s mixed run (sign-in of all: ${signInMs.toFixed(0)} ms)`);
    console.log('route                               requests     req/s   p50 ms   p95 ms   vs no-op  vs 1-query');
    for (const [label, xs] of Object.entries(times)) {
      const rps = xs.length / mixedSeconds;
      console.log(`${label.padEnd(34)}${String(xs.length).padStart(10)}${rps.toFixed(0).padStart(10)}${pct(xs, 50).toFixed(1).padStart(9)}${pct(xs, 95).toFixed(1).padStart(9)}${(rps / noop.rps).toFixed(2).padStart(11)}${(rps / query.rps).toFixed(2).padStart(11)}`);
    }
    console.log(`floor: signed-in no-op         ${noop.rps.toFixed(0).padStart(10)} req/s alone, p95 ${noop.p95.toFixed(1)} ms, failed ${noop.failed}`);
    console.log(`floor: signed-in one query     ${query.rps.toFixed(0).padStart(10)} req/s alone, p95 ${query.p95.toFixed(1)} ms, failed ${query.failed}`);
    console.log(`failed requests: ${failed}; answers acknowledged: ${ids.length}; of those in the database: ${found}; stored in all: ${stored} (the rest were in flight at the stop); stored twice: ${duplicates}`);
    const ok = failed === 0 && noop.failed === 0 && query.failed === 0 && found === ids.length && ids.length > 0 && duplicates === 0 && stored - ids.length <= TECHS;
    console.log(ok ? 'PASS: zero failed requests, zero lost or duplicated answers' : 'FAIL');
    if (!ok) process.exitCode = 1;
  } finally {
    // The app must be gone before its database is dropped, or its last in-flight queries log errors.
    if (app && app.exitCode === null) await new Promise((r) => (app!.once('exit', r), app!.kill()));
    await db.destroy();
    dropDatabase(cluster, dbName);
  }
}

await main();
