// `npm run check:faults`: scripted fault checks against real server processes and a private
// PostgreSQL cluster of their own (.data/pg-faults, stopped and started here; the app's and the
// tests' clusters are never touched). Prints one table of results and exits non-zero on a failure.
//   A. PostgreSQL restarted while technicians answer walk steps: 503 with a clear message while it
//      is down (never 500, never a hang), recovery without restarting the server, and every answer
//      the client was told was saved stored exactly once.
//   B. The mail queue resumes: a message waiting while the server process is down and PostgreSQL
//      restarts is delivered when they are back; a running server's queue survives a restart too.
//   C. Two server processes on one database: one session, one walk, continued on either.
//   D. The search server going away: search answers from PostgreSQL.
// Env: FAULTS_TECHS (default 20), FAULTS_DOWN_S (seconds PostgreSQL stays down, default 4).
import { randomBytes, randomUUID } from 'node:crypto';
import { SMTPServer } from 'smtp-server';
import { register } from 'tsx/esm/api';
import { SAMPLE_GUIDE } from '../src/shared/guides/sample';
import type { GuideContent } from '../src/shared/guides/schema';
import type { WalkAnswer } from '../src/shared/walks/answers';
import { replayPath } from '../src/shared/walks/walk-path';
import { createDb, migrateLatest, type Db } from '../server/db/knex';
import { startFakeMeili } from '../tests/fakes/meilisearch';
import { dropDatabase, ensureCluster, ensureDatabase, stopCluster, type Cluster } from './lib/cluster';
import { freePort, startServerProcess, type ServerProcess } from './lib/server-process';
import { seedTechnicians } from './lib/seed-technicians';

register();
const TECHS = Number(process.env.FAULTS_TECHS ?? 20);
const DOWN_S = Number(process.env.FAULTS_DOWN_S ?? 4);
const PASSWORD = 'faults-password-not-secret';
/** A client gives up on a request after this long; a request that takes longer counts as a hang. */
const CLIENT_TIMEOUT_MS = 15_000;
const CLUSTER = 'pg-faults';
const quiet = () => {};
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

interface Result {
  check: string;
  ok: boolean;
  detail: string;
}
const results: Result[] = [];
function record(check: string, ok: boolean, detail: string) {
  results.push({ check, ok, detail });
  console.log(`${ok ? 'PASS' : 'FAIL'}  ${check}: ${detail}`);
}

// ---- the private cluster ---------------------------------------------------------------------

let cluster: Cluster;
async function pgStart() {
  const again = await ensureCluster({ name: CLUSTER, durable: true, log: quiet });
  // The servers keep the address they were given; a moved port would look like a failed recovery.
  if (cluster && again.port !== cluster.port) throw new Error(`the ${CLUSTER} cluster came back on port ${again.port}, not ${cluster.port}`);
  cluster = again;
}
function pgStop() {
  stopCluster(CLUSTER, quiet);
}

async function freshDatabase(name: string): Promise<{ db: Db; url: string; drop: () => Promise<void> }> {
  dropDatabase(cluster, name);
  ensureDatabase(cluster, name);
  const url = cluster.urlFor(name);
  const db = createDb(url, { max: 3 });
  await migrateLatest(db);
  return {
    db,
    url,
    drop: async () => {
      await db.destroy();
      dropDatabase(cluster, name);
    },
  };
}

/** An organisation with technicians and the sample guide published, written straight to the tables. */
function seed(db: Db, techs: number, label: string) {
  return seedTechnicians(db, techs, label, PASSWORD);
}

// ---- server processes ------------------------------------------------------------------------

type AppProcess = ServerProcess;

/** A server whose log is kept for the report when something fails. */
function startApp(env: Record<string, string>): Promise<AppProcess> {
  return startServerProcess({ LOGIN_RATE_LIMIT: '100000', FAKE_SMTP: '1', ...env }, { captureLog: true });
}

interface Reply {
  status: number;
  body: any;
  ms: number;
  /** 'timeout' or 'network' when no HTTP answer came. */
  error?: 'timeout' | 'network';
}

/** One signed-in request as the browser client makes it: same-origin, JSON, with a time limit. */
async function call(base: string, cookie: string, method: string, path: string, body?: unknown): Promise<Reply> {
  const t0 = performance.now();
  try {
    const res = await fetch(base + path, {
      method,
      headers: { 'content-type': 'application/json', origin: base, cookie },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: AbortSignal.timeout(CLIENT_TIMEOUT_MS),
    });
    const text = await res.text();
    let parsed: unknown = null;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      parsed = text;
    }
    return { status: res.status, body: parsed, ms: performance.now() - t0 };
  } catch (err) {
    const timeout = (err as Error).name === 'TimeoutError';
    return { status: 0, body: null, ms: performance.now() - t0, error: timeout ? 'timeout' : 'network' };
  }
}

async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json', origin: base }, body: JSON.stringify({ email, password: PASSWORD }) });
  if (!res.ok) throw new Error(`sign-in failed for ${email}: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

/** A valid next entry for the sample guide where the walk stands: cautions first, then an answer. */
function nextEntry(content: GuideContent, log: WalkAnswer[]): WalkAnswer | null {
  const state = replayPath(content, log);
  if (state.ended || !state.current) return null;
  const base = { id: randomUUID(), stepId: state.current, answeredAt: new Date().toISOString() };
  if (state.unacknowledged.length) return { ...base, kind: 'acknowledge', cautionIds: state.unacknowledged };
  const step = content.steps.find((s) => s.id === state.current)!;
  if (step.kind === 'ask') return { ...base, kind: 'choice', choiceId: step.choices[0].id };
  if (step.kind === 'try') return { ...base, kind: 'try', fixed: false };
  if (step.kind === 'measure' && !step.calculator) {
    const band = step.bands[0];
    const value = band.max !== null ? band.max - (band.maxInclusive ? 0 : 0.01) : band.min !== null ? band.min + 1 : 0;
    return { ...base, kind: 'reading', value, unit: step.bandUnit };
  }
  return null;
}

// ---- A. PostgreSQL restarted while walks are answered ------------------------------------------

async function checkRestartDuringWalks() {
  const { db, url, drop } = await freshDatabase('faults_walks');
  const app = await startApp({ DATABASE_URL: url, SESSION_SECRET: randomBytes(32).toString('hex') });
  try {
    const { emails, guideId } = await seed(db, TECHS, 'restart');
    const cookies = await Promise.all(emails.map((e) => signIn(app.base, e)));
    const acknowledged = new Set<string>();
    const statuses = new Map<string, number>();
    const failures: string[] = [];
    let slowest = 0;
    let phase: 'before' | 'down' | 'after' = 'before';
    const afterRestart = { acknowledged: 0 };
    let stopping = false;
    const count = (key: string) => statuses.set(key, (statuses.get(key) ?? 0) + 1);
    const note = (r: Reply, what: string) => {
      slowest = Math.max(slowest, r.ms);
      if (r.error) {
        count(r.error);
        failures.push(`${what}: ${r.error} after ${r.ms.toFixed(0)} ms`);
      } else if (r.status >= 500) {
        count(String(r.status));
        const message = r.body?.error?.message ?? '';
        if (r.status !== 503 || r.body?.error?.code !== 'unavailable' || !/database is not reachable/i.test(message)) {
          failures.push(`${what}: ${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
        }
      } else if (r.status >= 400) {
        count(String(r.status));
        failures.push(`${what}: ${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
      } else count(`${Math.floor(r.status / 100)}xx`);
    };

    // One technician as the phone runner drives the server: entries queue on the device and go in
    // order as one batch; a batch that gets no answer or a 5xx stays queued and goes again with
    // the next answer, and the walk's queue is sent until empty before the next walk starts.
    async function technician(cookie: string) {
      for (;;) {
        const startKey = randomUUID();
        let walk: { id: number } | null = null;
        while (!walk) {
          if (stopping) return;
          const r = await call(app.base, cookie, 'POST', '/api/walks', { guideId, site: 'Restart plant', clientId: startKey });
          note(r, 'start a walk');
          if (r.status === 200 || r.status === 201) walk = r.body.walk;
          else await sleep(250 + Math.random() * 250);
        }
        const log: WalkAnswer[] = [];
        let queue: WalkAnswer[] = [];
        // Sends what waits on the device; true when the server took it all.
        const send = async () => {
          const r = await call(app.base, cookie, 'POST', `/api/walks/${walk!.id}/answers/batch`, { answers: queue });
          note(r, 'answer a step');
          if (r.status === 200) {
            for (const e of queue) {
              acknowledged.add(e.id);
              if (phase === 'after') afterRestart.acknowledged++;
            }
            log.push(...queue);
            queue = [];
            return true;
          }
          if (r.status >= 400 && r.status < 500) throw new Error(`a queued answer was refused: ${r.status}`);
          await sleep(250 + Math.random() * 250);
          return false;
        };
        try {
          // The technician keeps answering while answers wait on the device, as the runner allows.
          for (let depth = 0; depth < 6; depth++) {
            const entry = nextEntry(SAMPLE_GUIDE, [...log, ...queue]);
            if (!entry) break;
            queue.push(entry);
            await send();
          }
          while (queue.length) await send();
        } catch {
          return;
        }
        if (stopping) return;
      }
    }

    const pid = app.child.pid;
    const running = cookies.map((c) => technician(c));
    await sleep(3000);
    const before = acknowledged.size;
    phase = 'down';
    const stoppedAt = performance.now();
    pgStop();
    await sleep(DOWN_S * 1000);
    await pgStart();
    phase = 'after';
    // How long until the server answers health again, without being restarted.
    let recoveredMs = NaN;
    for (let i = 0; i < 300; i++) {
      const h = await call(app.base, '', 'GET', '/api/health');
      if (h.status === 200) {
        recoveredMs = performance.now() - stoppedAt - DOWN_S * 1000;
        break;
      }
      await sleep(100);
    }
    await sleep(5000);
    stopping = true;
    await Promise.all(running);

    const ids = [...acknowledged];
    let found = 0;
    for (let i = 0; i < ids.length; i += 5000)
      found += Number(
        (
          await db('walk_answers')
            .whereIn('client_id', ids.slice(i, i + 5000))
            .count('* as n')
        )[0].n,
      );
    const stored = Number((await db('walk_answers').count('* as n'))[0].n);
    const duplicates = Number((await db.raw('select count(*)::int as n from (select walk_id, client_id from walk_answers group by 1, 2 having count(*) > 1) d')).rows[0].n);
    const sameProcess = app.child.exitCode === null && app.child.pid === pid;
    const got503 = statuses.get('503') ?? 0;
    const got500 = [...statuses].filter(([k]) => /^5\d\d$/.test(k) && k !== '503').reduce((a, [, n]) => a + n, 0);
    const hangs = (statuses.get('timeout') ?? 0) + (statuses.get('network') ?? 0);
    const summary = [...statuses].map(([k, n]) => `${k}: ${n}`).join(', ');
    // What the server logged for its 500s, so a failure names its cause.
    const unhandled = app.log
      .filter((l) => l.includes('unhandled error'))
      .map((l) => {
        const e = JSON.parse(l).err ?? {};
        return `${e.code ?? ''} ${String(e.message ?? '').slice(0, 160)}`.trim();
      });
    if (unhandled.length) failures.unshift(`server log: ${[...new Set(unhandled)].slice(0, 3).join(' | ')}`);

    record(
      'A1 requests while PostgreSQL is down',
      got503 > 0 && got500 === 0 && hangs === 0 && failures.length === 0,
      `${TECHS} technicians; PostgreSQL stopped (pg_ctl -m fast) for ${DOWN_S} s; replies ${summary}; 503 "database is not reachable" ${got503}, other 5xx ${got500}, no reply ${hangs}, slowest reply ${(slowest / 1000).toFixed(1)} s (client limit ${CLIENT_TIMEOUT_MS / 1000} s)` +
        (failures.length ? `; first problems: ${failures.slice(0, 3).join(' | ')}` : ''),
    );
    record(
      'A2 recovery without restarting the server',
      sameProcess && Number.isFinite(recoveredMs) && afterRestart.acknowledged > 0,
      `same process ${sameProcess ? 'still running' : 'GONE'}; health 200 again ${Number.isFinite(recoveredMs) ? `${(recoveredMs / 1000).toFixed(1)} s after PostgreSQL was started` : 'NEVER'}; ${afterRestart.acknowledged} answers acknowledged after the restart (${before} before the stop)`,
    );
    record(
      'A3 every acknowledged answer stored exactly once',
      ids.length > 0 && found === ids.length && duplicates === 0 && stored === ids.length,
      `acknowledged ${ids.length}; of those in the database ${found}; stored in all ${stored}; stored twice ${duplicates}`,
    );
  } finally {
    await app.stop();
    await drop();
  }
}

// ---- B. the mail queue resumes ----------------------------------------------------------------

/** A mail server the check can stop and start; keeps what it receives in memory. */
async function startSink() {
  const received: string[] = [];
  const port = await freePort();
  let server: SMTPServer | null = null;
  const start = () =>
    new Promise<void>((r) => {
      server = new SMTPServer({
        authOptional: true,
        disabledCommands: ['STARTTLS', 'AUTH'],
        logger: false,
        onData(stream, _session, done) {
          let raw = '';
          stream.on('data', (b: Buffer) => (raw += b.toString()));
          stream.on('end', () => {
            received.push(raw);
            done();
          });
        },
      });
      server.listen(port, '127.0.0.1', () => r());
    });
  const stop = () => new Promise<void>((r) => (server ? server.close(() => r()) : r()));
  return { port, received, start, stop };
}

async function waitFor<T>(what: () => Promise<T | undefined>, ms: number): Promise<T | undefined> {
  const until = Date.now() + ms;
  for (;;) {
    const v = await what().catch(() => undefined);
    if (v !== undefined) return v;
    if (Date.now() > until) return undefined;
    await sleep(200);
  }
}

async function checkMailQueue() {
  const { db, url, drop } = await freshDatabase('faults_mail');
  const sink = await startSink();
  const env = {
    DATABASE_URL: url,
    SESSION_SECRET: randomBytes(32).toString('hex'),
    FAKE_SMTP: '0',
    SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
    MAIL_POLL_S: '0.5',
    MAIL_RETRY_DELAY_S: '1',
    MAIL_RETRY_BACKOFF: '0',
    MAIL_RETRY_LIMIT: '50',
    MAIL_TIMEOUT_S: '5',
    RESET_RATE_LIMIT: '1000',
  };
  let app: AppProcess | null = null;
  try {
    const { emails } = await seed(db, 2, 'mail');
    const reset = (email: string) =>
      fetch(`${app!.base}/api/auth/password-reset`, { method: 'POST', headers: { 'content-type': 'application/json', origin: app!.base }, body: JSON.stringify({ email }) });
    const messageFor = async (email: string) => db('mail_messages').where({ to_address: email }).first('id', 'status', 'attempts', 'message_id');

    // B1: the mail server is down, so the message waits; then the server process stops, PostgreSQL
    // restarts, the mail server comes back and a new server process starts: it must go out, once.
    app = await startApp(env);
    await reset(emails[0]);
    const waiting = await waitFor(async () => {
      const m = await messageFor(emails[0]);
      return m && m.status === 'retrying' ? m : undefined;
    }, 15_000);
    await app.stop();
    pgStop();
    await sleep(1000);
    await pgStart();
    await sink.start();
    const t0 = performance.now();
    app = await startApp(env);
    const sent = await waitFor(async () => {
      const m = await messageFor(emails[0]);
      return m && m.status === 'sent' ? m : undefined;
      // The new process takes the job up at its next retry, or, if the stop cut an attempt off, once
      // that attempt has expired (60 s with these settings).
    }, 90_000);
    const copies = sent ? sink.received.filter((raw) => raw.includes(sent.message_id)).length : 0;
    record(
      'B1 mail waiting while the server is down and PostgreSQL restarts',
      !!waiting && !!sent && copies === 1,
      `message ${waiting ? `waited (status retrying after ${waiting.attempts} attempt(s), mail server down)` : 'NEVER reached retrying'}; server process stopped, PostgreSQL restarted, mail server and a new server process started; ` +
        (sent ? `sent ${((performance.now() - t0) / 1000).toFixed(1)} s after the new start, ${copies} cop${copies === 1 ? 'y' : 'ies'} received` : 'NOT sent within 90 s'),
    );

    // B2: the server keeps running through a PostgreSQL restart; its queue worker must pick up again.
    pgStop();
    await sleep(DOWN_S * 1000);
    await pgStart();
    await waitFor(async () => ((await fetch(`${app!.base}/api/health`)).ok ? true : undefined), 30_000);
    const t1 = performance.now();
    await reset(emails[1]);
    const sent2 = await waitFor(async () => {
      const m = await messageFor(emails[1]);
      return m && m.status === 'sent' ? m : undefined;
    }, 30_000);
    const copies2 = sent2 ? sink.received.filter((raw) => raw.includes(sent2.message_id)).length : 0;
    record(
      'B2 mail queued after PostgreSQL restarts under a running server',
      !!sent2 && copies2 === 1,
      `PostgreSQL stopped ${DOWN_S} s and started; the same server process ${sent2 ? `sent a new message ${((performance.now() - t1) / 1000).toFixed(1)} s after it was asked, ${copies2} cop${copies2 === 1 ? 'y' : 'ies'} received` : 'did NOT send a new message within 30 s'}`,
    );
  } finally {
    await app?.stop();
    await sink.stop();
    await drop();
  }
}

// ---- C. two server processes on one database --------------------------------------------------

async function checkTwoServers() {
  const { db, url, drop } = await freshDatabase('faults_two');
  // Behind a load balancer both share one secret and one database; nothing else is shared.
  const env = { DATABASE_URL: url, SESSION_SECRET: randomBytes(32).toString('hex') };
  const [a, b] = await Promise.all([startApp(env), startApp(env)]);
  try {
    const { emails, guideId } = await seed(db, 1, 'two');
    const cookie = await signIn(a.base, emails[0]);
    const steps: string[] = [];
    const expect = (ok: boolean, what: string) => steps.push(`${ok ? 'ok' : 'FAILED'}: ${what}`);
    const started = await call(a.base, cookie, 'POST', '/api/walks', { guideId, site: 'Two servers plant' });
    const walkId = started.body?.walk?.id as number;
    const first = nextEntry(SAMPLE_GUIDE, [])!;
    const onA = await call(a.base, cookie, 'POST', `/api/walks/${walkId}/answers`, first);
    expect(started.status === 201 && onA.status === 201, 'signed in, started a walk and answered its first step on A');
    const seenOnB = await call(b.base, cookie, 'GET', `/api/walks/${walkId}`);
    expect(seenOnB.status === 200 && seenOnB.body.walk.answers.length === 1 && seenOnB.body.walk.answers[0].id === first.id, 'B, with the same cookie, sees the walk and its answer');
    const second = nextEntry(SAMPLE_GUIDE, [first])!;
    const onB = await call(b.base, cookie, 'POST', `/api/walks/${walkId}/answers`, second);
    const retryOnA = await call(a.base, cookie, 'POST', `/api/walks/${walkId}/answers`, second);
    expect(onB.status === 201 && retryOnA.status === 200 && retryOnA.body.duplicate === true, 'B continues the walk; the same entry sent again to A is taken as a duplicate');
    const seenOnA = await call(a.base, cookie, 'GET', `/api/walks/${walkId}`);
    expect(seenOnA.status === 200 && seenOnA.body.walk.answers.map((x: { id: string }) => x.id).join() === [first.id, second.id].join(), "A sees B's answer, in order");
    const out = await call(b.base, cookie, 'POST', '/api/auth/logout');
    const meA = await call(a.base, cookie, 'GET', '/api/auth/me');
    const walkA = await call(a.base, cookie, 'GET', `/api/walks/${walkId}`);
    expect(out.status === 204 && meA.body?.user === null && walkA.status === 401, 'signing out on B ends the session on A too');
    const stored = Number((await db('walk_answers').where({ walk_id: walkId }).count('* as n'))[0].n);
    expect(stored === 2, `the database holds the walk's 2 answers once each (${stored})`);
    record(
      'C  two server processes on one database',
      steps.every((s) => s.startsWith('ok')),
      steps.join('; '),
    );
  } finally {
    await Promise.all([a.stop(), b.stop()]);
    await drop();
  }
}

// ---- D. the search server going away ----------------------------------------------------------

async function checkSearchFallback() {
  const { db, url, drop } = await freshDatabase('faults_search');
  const fake = await startFakeMeili();
  const app = await startApp({ DATABASE_URL: url, SESSION_SECRET: randomBytes(32).toString('hex'), MEILI_URL: fake.url, MEILI_API_KEY: fake.apiKey, MEILI_TIMEOUT_MS: '300' });
  try {
    const { emails } = await seed(db, 1, 'search');
    const cookie = await signIn(app.base, emails[0]);
    // The first search finds no index for the organisation and has the sync job make one; from
    // then on the search server answers.
    let up = await call(app.base, cookie, 'GET', '/api/search?q=drip');
    for (let i = 0; i < 75 && up.body?.engine !== 'meilisearch'; i++) {
      await sleep(200);
      up = await call(app.base, cookie, 'GET', '/api/search?q=drip');
    }
    await fake.stop();
    const down = await call(app.base, cookie, 'GET', '/api/search?q=drip');
    await fake.start();
    const back = await call(app.base, cookie, 'GET', '/api/search?q=drip');
    const ok = up.status === 200 && up.body?.engine === 'meilisearch' && down.status === 200 && down.body?.engine === 'postgres' && down.body?.fallback === true && back.status === 200;
    record(
      'D  search server going away',
      ok,
      `with the search server up ${up.status} (${up.body?.engine}); stopped: ${down.status} from ${down.body?.engine}${down.body?.fallback ? ' (fallback)' : ''} in ${down.ms.toFixed(0)} ms; back: ${back.status}. In depth: tests/api/search-meili.test.ts (slow server, missed updates replayed)`,
    );
  } finally {
    await app.stop();
    await fake.close();
    await drop();
  }
}

// ---- run ---------------------------------------------------------------------------------------

async function main() {
  await pgStart();
  console.log(`Fault checks on the private cluster ${cluster.root} (port ${cluster.port}).\n`);
  const checks: [string, () => Promise<void>][] = [
    ['A PostgreSQL restarted while walks are answered', checkRestartDuringWalks],
    ['B mail queue after restarts', checkMailQueue],
    ['C two server processes', checkTwoServers],
    ['D search server going away', checkSearchFallback],
  ];
  const only = process.argv.slice(2).map((s) => s.toUpperCase());
  for (const [name, run] of checks) {
    if (only.length && !only.includes(name[0])) continue;
    try {
      await run();
    } catch (err) {
      record(name, false, `the check itself failed: ${(err as Error).stack ?? err}`);
      // A check that died with PostgreSQL stopped must not take the next ones down with it.
      await pgStart().catch(() => undefined);
    }
  }
  const width = Math.max(...results.map((r) => r.check.length));
  console.log(`\n${'check'.padEnd(width)}  result  detail`);
  for (const r of results) console.log(`${r.check.padEnd(width)}  ${r.ok ? 'PASS  ' : 'FAIL  '}  ${r.detail}`);
  const failed = results.filter((r) => !r.ok).length;
  console.log(failed ? `\n${failed} of ${results.length} checks FAILED` : `\nall ${results.length} checks passed`);
  pgStop();
  process.exitCode = failed ? 1 : 0;
}

await main();
