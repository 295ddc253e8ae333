// `npm run bench:load`: simulated technicians on loopback (autocannon), each signing in, starting a
// walk on the sample guide, answering its first step, leaving the walk and searching, over and over.
// Then, in separate phases with the same connections and duration: the two floors (a signed-in
// no-op and a signed-in one-query route) and answering walk steps alone, so the answer route's
// throughput can be compared with the floors like for like (target: at least 40 % of one query).
// Proves zero failed requests and that every acknowledged answer is in the database exactly once.
// Env: BENCH_TECHS (default 50), BENCH_SECONDS (default 20; each later phase a third of it, at
// least 5 s). Uses its own database in the test cluster.
import type { ChildProcess } from 'node:child_process';
import { randomBytes, randomUUID } from 'node:crypto';
import autocannon from 'autocannon';
import { register } from 'tsx/esm/api';
import { SAMPLE_GUIDE } from '../src/shared/guides/sample';
import { createDb, migrateLatest } from '../server/db/knex';
import { dropDatabase, ensureCluster, ensureDatabase } from '../scripts/lib/cluster';
import { seedTechnicians } from '../scripts/lib/seed-technicians';
import { startServerProcess } from '../scripts/lib/server-process';

register();
const TECHS = Number(process.env.BENCH_TECHS ?? 50);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 20);
/** autocannon's own default: a request without an answer after this long counts as failed. */
const TIMEOUT_S = 10;
const PASSWORD = 'bench-password-not-secret';

const pct = (xs: number[], p: number) => {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))];
};

function startApp(dbUrl: string) {
  return startServerProcess({ DATABASE_URL: dbUrl, LOGIN_RATE_LIMIT: '100000' });
}

async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: base }, body: JSON.stringify({ email, password: PASSWORD }) });
  if (!res.ok) throw new Error(`sign-in failed for ${email}: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

type Step = (typeof SAMPLE_GUIDE.steps)[number];

/**
 * A valid answer at the walk's current step: acknowledge its cautions if any, else the first choice,
 * a reading inside the first band, or "it did not fix it"; null when the step takes no answer here.
 */
function answerFor(stepId: string | undefined, cautions: string[] | undefined): Record<string, unknown> | null {
  if (!stepId) return null;
  if (cautions?.length) return { stepId, kind: 'acknowledge', cautionIds: cautions };
  const step = SAMPLE_GUIDE.steps.find((x) => x.id === stepId) as Step | undefined;
  if (!step) return null;
  if (step.kind === 'ask') return { stepId, kind: 'choice', choiceId: step.choices[0].id };
  if (step.kind === 'try') return { stepId, kind: 'try', fixed: false };
  if (step.kind === 'measure' && !step.calculator) {
    const band = step.bands[0];
    const value = band.max !== null ? band.max - (band.maxInclusive ? 0 : 0.01) : band.min !== null ? band.min + 1 : 0;
    return { stepId, kind: 'reading', value, unit: step.bandUnit };
  }
  return null;
}

function firstAnswer(ctx: Ctx): Record<string, unknown> {
  return answerFor(ctx.stepId, ctx.cautions) ?? { stepId: ctx.stepId, kind: 'choice', choiceId: 'none' };
}

type Ctx = {
  cookie?: string;
  walkId?: number;
  stepId?: string;
  cautions?: string[];
  sentAt?: number;
  label?: string;
  answerId?: string;
};

interface PhaseResult {
  label: string;
  requests: number;
  rps: number;
  p50: number;
  p95: number;
  failed: number;
}

/** One route alone, every technician's connection busy for the phase: throughput, latency, failures. */
async function phase(base: string, label: string, seconds: number, request: object, onStatus?: (status: number, body: string, ctx: any) => void): Promise<PhaseResult> {
  const times: number[] = [];
  let failed = 0;
  const inst = autocannon({
    url: base,
    connections: TECHS,
    duration: seconds,
    timeout: TIMEOUT_S,
    requests: [
      {
        ...request,
        onResponse: (status: number, body: string, ctx: Ctx) => {
          times.push(performance.now() - (ctx.sentAt ?? 0));
          if (status >= 300) {
            failed++;
            if (failed < 5) console.error(`${label} -> ${status} ${body.slice(0, 200)}`);
          }
          onStatus?.(status, body, ctx);
        },
      },
    ],
  } as any);
  const r: any = await inst;
  // autocannon counts a timeout among its errors as well; non-2xx answers were counted above.
  failed += r.errors;
  if (r.errors) console.error(`${label}: ${r.errors} requests without an answer, ${r.timeouts} of them timed out (no answer in ${TIMEOUT_S} s)`);
  return { label, requests: times.length, rps: times.length / (r.duration || seconds), p50: pct(times, 50), p95: pct(times, 95), failed };
}

async function main() {
  // Answers must be stored durably, so the bench runs on a cluster of its own with fsync and
  // synchronous commit on (the tests' cluster runs without them, for speed): every acknowledged
  // answer has reached the disk's write-ahead log before the technician's phone is told it is saved.
  const cluster = await ensureCluster({ name: 'pg-bench', durable: true, log: () => {} });
  const dbName = `bench_load_${randomBytes(4).toString('hex')}`;
  ensureDatabase(cluster, dbName);
  const dbUrl = cluster.urlFor(dbName);
  const db = createDb(dbUrl, { max: 4 });
  let app: ChildProcess | null = null;
  try {
    await migrateLatest(db);
    const seeded = await seedTechnicians(db, TECHS, 'load', PASSWORD);
    const { emails } = seeded;
    const org = { id: seeded.organisationId };
    const guide = { id: seeded.guideId };
    const version = { id: seeded.versionId };

    // The app reaches PostgreSQL as `npm start` does: through the cluster's Unix socket when it can
    // (BENCH_PG_TCP=1 forces loopback TCP).
    const appDbUrl = process.env.BENCH_PG_TCP === '1' ? dbUrl : cluster.localUrlFor(dbName);
    const started = await startApp(appDbUrl);
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
      timeout: TIMEOUT_S,
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
            stamp(ctx, req, {
              path: `/api/walks/${ctx.walkId}/answers`,
              body: JSON.stringify({ id: (ctx.answerId = `ans-${randomUUID()}`), answeredAt: new Date().toISOString(), ...firstAnswer(ctx) }),
            }),
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
    // `failures` counted every non-2xx answer; autocannon's errors include its timeouts.
    const mixedFailed = failures + mixed.errors;
    if (mixed.errors) console.error(`mixed run: ${mixed.errors} requests without an answer, ${mixed.timeouts} of them timed out (no answer in ${TIMEOUT_S} s)`);

    // Separate phases, same connections, same duration: the floors, then answering alone.
    const PHASE = Math.max(5, Math.round(SECONDS / 3));
    let n = 0;
    const signedGet = (path: string) => ({
      method: 'GET',
      path,
      setupRequest: (req: any, ctx: Ctx) => {
        ctx.cookie ??= cookies[n++ % cookies.length];
        ctx.sentAt = performance.now();
        return { ...req, headers: { ...req.headers, cookie: ctx.cookie } };
      },
    });
    const noop = await phase(base, 'floor: signed-in no-op', PHASE, signedGet('/api/health/floor/noop'));
    const query = await phase(base, 'floor: signed-in one query', PHASE, signedGet('/api/health/floor/query'));

    // Each connection answers up to four steps of a walk (choice, reading, cautions, try), then the
    // next of its own walks, made beforehand so the phase measures answering and nothing else.
    const users = (await db('users').whereIn('email', emails).select('id', 'email')) as { id: number; email: string }[];
    const userOf = new Map(users.map((u) => [u.email, u.id]));
    const perTech = Math.ceil((Math.max(query.rps, noop.rps) * PHASE * 2) / TECHS / 2) + 5;
    const walkRows = emails.flatMap((email) =>
      Array.from({ length: perTech }, () => ({
        organisation_id: org.id,
        guide_id: guide.id,
        guide_version_id: version.id,
        user_id: userOf.get(email),
        status: 'open',
        current_step_id: SAMPLE_GUIDE.startStepId,
        site: 'Load plant',
      })),
    );
    const walksOf = new Map<number, number[]>();
    for (let i = 0; i < walkRows.length; i += 2000) {
      const made = (await db('walks')
        .insert(walkRows.slice(i, i + 2000))
        .returning(['id', 'user_id'])) as { id: number; user_id: number }[];
      for (const w of made) walksOf.set(w.user_id, (walksOf.get(w.user_id) ?? []).concat(w.id));
    }
    // The planner's statistics as autovacuum keeps them on a running system: without this it would
    // still plan for the nearly empty walks table of a minute ago (and pick a poor index for the
    // answer's guarded update) until autovacuum's next round, in the middle of the phase.
    await db.raw('analyze walks, walk_answers');
    // autocannon clears a connection's context after every request of the list, so each walk's
    // progress lives in a cursor taken from a free list for the request and put back with its answer.
    type Cursor = { cookie: string; walks: number[]; walkId?: number; stepId?: string; cautions: string[]; depth: number };
    const free: Cursor[] = [];
    cookies.forEach((cookie, i) => {
      const mine = walksOf.get(userOf.get(emails[i])!) ?? [];
      const half = Math.ceil(mine.length / 2);
      for (const walks of [mine.slice(0, half), mine.slice(half)]) free.push({ cookie, walks, cautions: [], depth: 4 });
    });
    const nextWalk = (c: Cursor) => {
      c.walkId = c.walks.shift();
      c.stepId = SAMPLE_GUIDE.startStepId;
      c.cautions = [];
      c.depth = 0;
    };
    const inFlight = new Map<Cursor, number>();
    const answeredAlone = new Set<string>();
    let ranOut = 0;
    const answerAlone = await phase(
      base,
      'POST /api/walks/:id/answers alone',
      PHASE,
      {
        method: 'POST',
        setupRequest: (req: any, ctx: Ctx & { cursor?: Cursor }) => {
          // A request that timed out never reaches onResponse; its cursor is taken back after the timeout.
          const c = free.pop() ?? [...inFlight].find(([, at]) => performance.now() - at > TIMEOUT_S * 1000)?.[0];
          if (!c) throw new Error('more connections than walk cursors');
          inFlight.set(c, performance.now());
          ctx.cursor = c;
          let body = c.depth < 4 ? answerFor(c.stepId, c.cautions) : null;
          if (!body) {
            nextWalk(c);
            if (c.walkId === undefined) ranOut++;
            body = answerFor(c.stepId, c.cautions);
          }
          ctx.answerId = `solo-${randomUUID()}`;
          ctx.sentAt = performance.now();
          return { ...req, path: `/api/walks/${c.walkId}/answers`, body: JSON.stringify({ id: ctx.answerId, answeredAt: new Date().toISOString(), ...body }), headers: { ...json, cookie: c.cookie } };
        },
      },
      (status, body, ctx: Ctx & { cursor?: Cursor }) => {
        const c = ctx.cursor!;
        if (!inFlight.delete(c)) return;
        free.push(c);
        if (status !== 201) {
          c.depth = 4;
          return;
        }
        const out = JSON.parse(body);
        if (out.duplicate === false) answeredAlone.add(ctx.answerId!);
        c.depth += 1;
        c.stepId = out.state?.ended ? undefined : out.state?.at;
        c.cautions = out.state?.unacknowledged ?? [];
      },
    );
    if (ranOut) console.error(`${ranOut} answer requests found no walk left: make more walks per technician`);

    // Answers still in flight when a run stops are stored but never acknowledged; what matters is
    // that every acknowledged one is there exactly once, and nothing is stored twice.
    const stored = Number((await db('walk_answers').count('* as n'))[0].n);
    const ids = [...acknowledgedIds, ...answeredAlone];
    let found = 0;
    for (let i = 0; i < ids.length; i += 5000)
      found += Number(
        (
          await db('walk_answers')
            .whereIn('client_id', ids.slice(i, i + 5000))
            .count('* as n')
        )[0].n,
      );
    const duplicates = Number((await db.raw('select count(*)::int as n from (select client_id from walk_answers group by client_id having count(*) > 1) d')).rows[0].n);

    const row = (label: string, count: number, rps: number, p50: number, p95: number) =>
      `${label.padEnd(38)}${String(count).padStart(9)}${rps.toFixed(0).padStart(9)}${p50.toFixed(1).padStart(9)}${p95.toFixed(1).padStart(9)}${(rps / noop.rps).toFixed(2).padStart(10)}${(rps / query.rps).toFixed(2).padStart(11)}`;
    const head = `${'route'.padEnd(38)}${'requests'.padStart(9)}${'req/s'.padStart(9)}${'p50 ms'.padStart(9)}${'p95 ms'.padStart(9)}${'vs no-op'.padStart(10)}${'vs 1-query'.padStart(11)}`;
    console.log(`\nPostgreSQL through ${appDbUrl.includes('?host=') ? 'its Unix socket' : 'loopback TCP'}`);
    console.log(`${TECHS} technicians, mixed run ${SECONDS} s (sign-in of all: ${signInMs.toFixed(0)} ms); each route is a quarter of every loop`);
    console.log(head);
    for (const [label, xs] of Object.entries(times)) console.log(row(label, xs.length, xs.length / mixedSeconds, pct(xs, 50), pct(xs, 95)));
    console.log(`\nphases alone, ${TECHS} connections, ${PHASE} s each`);
    console.log(head);
    for (const p of [noop, query, answerAlone]) console.log(row(p.label, p.requests, p.rps, p.p50, p.p95));
    const failed = mixedFailed + noop.failed + query.failed + answerAlone.failed;
    console.log(`\nfailed requests: ${failed} (mixed ${mixedFailed}, floors ${noop.failed + query.failed}, answers alone ${answerAlone.failed})`);
    console.log(
      `answers acknowledged: ${ids.length} (mixed ${acknowledgedIds.size}, alone ${answeredAlone.size}); of those in the database: ${found}; stored in all: ${stored} (the rest were in flight at a stop); stored twice: ${duplicates}`,
    );
    const ok = failed === 0 && found === ids.length && acknowledgedIds.size > 0 && answeredAlone.size > 0 && duplicates === 0 && stored - ids.length <= 2 * TECHS;
    console.log(ok ? 'PASS: zero failed requests, zero lost or duplicated answers' : 'FAIL: failed requests, or lost or duplicated answers');
    const ratio = answerAlone.rps / query.rps;
    const target = ratio >= 0.4;
    console.log(`${target ? 'PASS' : 'FAIL'}: answering a walk step alone reaches ${(ratio * 100).toFixed(0)} % of the one-query floor (target at least 40 %)`);
    if (!ok || !target) process.exitCode = 1;
  } finally {
    // The app must be gone before its database is dropped, or its last in-flight queries log errors.
    if (app && app.exitCode === null) await new Promise((r) => (app!.once('exit', r), app!.kill()));
    await db.destroy();
    // BENCH_KEEP_DB=1 leaves the database for a look afterwards (its name is printed).
    if (process.env.BENCH_KEEP_DB === '1') console.log(`kept database ${dbName} in ${cluster.root}`);
    else dropDatabase(cluster, dbName);
  }
}

await main();
