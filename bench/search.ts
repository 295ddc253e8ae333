// `npm run bench:search`: builds a synthetic corpus in its own database of the test cluster,
// then measures /api/search (PostgreSQL engine, signed in as a technician, app in its own process)
// against the textbook full-text query run by pgbench, at 16 and 4 concurrent clients.
// Prints the figures and drops the database afterwards. Not part of `npm test`.
import { spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { Agent, request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { register } from 'tsx/esm/api';
import { DEFAULT_TAGS } from '../src/shared/tags';
import { createDb, migrateLatest, type Db } from '../server/db/knex';
import { hashPassword } from '../server/lib/passwords';
import { syncSearch } from '../server/modules/search/search.sync';
import { dropDatabase, ensureCluster, ensureDatabase } from '../scripts/lib/cluster';
import { startServerProcess } from '../scripts/lib/server-process';

// Knex loads the .ts migrations through Node's own loader.
register();

const ARTICLES = 20_000;
const GUIDES = 2_000;
const VOCABULARY = 8_000;
const QUERIES = 200;
const PASSWORD = 'bench-password-not-secret';

// ---- deterministic randomness -------------------------------------------------------------------

function rng(seed: number) {
  return () => {
    seed |= 0;
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const rand = rng(20261202);
const int = (lo: number, hi: number) => lo + Math.floor(rand() * (hi - lo + 1));
const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];

// The trade's words sit at middle ranks: common enough to matter, rare enough to find things.
const TRADE = [
  'drip',
  'drool',
  'dribble',
  'weep',
  'seep',
  'leak',
  'shot',
  'dot',
  'deposit',
  'bead',
  'valve',
  'applicator',
  'gun',
  'nozzle',
  'needle',
  'seat',
  'coil',
  'solenoid',
  'spring',
  'seal',
  'piston',
  'regulator',
  'filter',
  'hose',
  'heater',
  'melt',
  'glue',
  'adhesive',
  'epoxy',
  'silicone',
  'cyanoacrylate',
  'sealant',
  'viscosity',
  'pressure',
  'temperature',
  'stringing',
  'tail',
  'spitting',
  'skip',
  'drift',
  'placement',
  'clog',
  'cured',
  'debris',
  'chipped',
  'worn',
  'carbide',
  'stainless',
  'armature',
  'driver',
  'spike',
  'voltage',
  'duty',
  'purge',
  'bubble',
  'trapped',
  'shutoff',
  'stroke',
  'plunger',
  'diaphragm',
];

/** Pseudo-words with distinct English stems, so every rank is its own lexeme. */
async function vocabulary(db: Db): Promise<string[]> {
  const cons = 'bdfgklmnprtvz';
  const vows = 'aeiou';
  const candidates = new Set<string>();
  while (candidates.size < VOCABULARY * 1.3) {
    let w = '';
    for (let s = int(2, 3); s > 0; s--) w += cons[int(0, cons.length - 1)] + vows[int(0, vows.length - 1)];
    if (rand() < 0.5) w += pick(['k', 'n', 'r', 't', 'l']);
    candidates.add(w);
  }
  const list = [...candidates];
  const stems = await db.raw(`select w, ts_lexize('english_stem', w) as s from unnest(?::text[]) as w`, [list]);
  const seen = new Set<string>(TRADE);
  const words: string[] = [];
  for (const r of stems.rows as { w: string; s: string[] | null }[]) {
    const stem = r.s?.[0];
    if (!stem || seen.has(stem) || TRADE.includes(r.w)) continue;
    seen.add(stem);
    words.push(r.w);
    if (words.length === VOCABULARY - TRADE.length) break;
  }
  // Trade terms spread evenly over ranks 400 to 2400.
  TRADE.forEach((t, i) => words.splice(400 + Math.round((i * 2000) / TRADE.length), 0, t));
  return words;
}

/** Zipf (s = 1) over the vocabulary's ranks. */
function zipf(words: string[]) {
  const cdf: number[] = [];
  let sum = 0;
  for (let r = 1; r <= words.length; r++) cdf.push((sum += 1 / r));
  return (minRank = 0) => {
    const lo = minRank ? cdf[minRank - 1] : 0;
    const x = lo + rand() * (sum - lo);
    let a = 0;
    let b = cdf.length - 1;
    while (a < b) {
      const m = (a + b) >> 1;
      if (cdf[m] < x) a = m + 1;
      else b = m;
    }
    return words[a];
  };
}

function sentence(draw: ReturnType<typeof zipf>, n: number, minRank = 0) {
  const out: string[] = [];
  for (let i = 0; i < n; i++) out.push(draw(minRank));
  return out;
}

function prose(draw: ReturnType<typeof zipf>, n: number) {
  const words = sentence(draw, n);
  const parts: string[] = [];
  for (let i = 0; i < words.length; i += 12) parts.push(words.slice(i, i + 12).join(' ') + '.');
  return parts.join(' ');
}

// ---- the corpus ---------------------------------------------------------------------------------

async function buildCorpus(db: Db, words: string[]) {
  const draw = zipf(words);
  const [org] = await db('organisations').insert({ name: 'Bench works' }).returning('id');
  await db('tags').insert(DEFAULT_TAGS.map((t, i) => ({ organisation_id: org.id, group: t.group, slug: t.slug, label: t.label, position: i })));
  const hash = await hashPassword(PASSWORD);
  const [author] = await db('users')
    .insert({ organisation_id: org.id, email: 'author@bench.invalid', name: 'Bench author', roles: ['author'], password_hash: hash })
    .returning('id');
  await db('users').insert({ organisation_id: org.id, email: 'tech@bench.invalid', name: 'Bench technician', roles: ['technician'], password_hash: hash });
  const slugs = DEFAULT_TAGS.map((t) => t.slug);

  for (let start = 0; start < ARTICLES; start += 1000) {
    const n = Math.min(1000, ARTICLES - start);
    const ids: { id: number }[] = await db('articles')
      .insert(Array.from({ length: n }, (_, i) => ({ organisation_id: org.id, slug: `bench-${start + i}`, workflow: 'published', created_by: author.id })))
      .returning('id');
    const rows = ids.map(({ id }) => ({
      article_id: id,
      title: sentence(draw, int(4, 9), 50).join(' '),
      summary: sentence(draw, int(8, 16)).join(' '),
      body_text: prose(draw, int(150, 600)),
      tags: [pick(slugs), pick(slugs)].filter((t, i, a) => a.indexOf(t) === i),
    }));
    await db.raw(
      `insert into article_revisions (article_id, number, title, summary, body_json, body_html, body_text, tags, author_id)
       select x.article_id, 1, x.title, x.summary, '{"type":"doc","content":[]}'::jsonb, '', x.body_text, x.tags, ?
         from jsonb_to_recordset(?::jsonb) as x(article_id int, title text, summary text, body_text text, tags text[])`,
      [author.id, JSON.stringify(rows)],
    );
    process.stdout.write(`\rarticles ${start + n}/${ARTICLES}`);
  }
  await db.raw(`update articles a set head_revision_id = r.id, published_revision_id = r.id from article_revisions r where r.article_id = a.id`);
  process.stdout.write('\n');

  for (let start = 0; start < GUIDES; start += 500) {
    const n = Math.min(500, GUIDES - start);
    const ids: { id: number }[] = await db('guides')
      .insert(Array.from({ length: n }, () => ({ organisation_id: org.id, status: 'active', created_by: author.id })))
      .returning('id');
    const rows = ids.map(({ id }) => {
      const steps = Array.from({ length: int(6, 12) }, (_, k) =>
        k % 4 === 3
          ? { kind: 'finding', id: `s${k}`, title: sentence(draw, int(4, 8), 50).join(' '), causeCode: 'other', cause: prose(draw, int(12, 24)), remedy: [prose(draw, int(8, 16))] }
          : { kind: 'try', id: `s${k}`, title: sentence(draw, int(5, 10), 50).join(' '), action: prose(draw, int(15, 35)) },
      );
      return {
        guide_id: id,
        title: sentence(draw, int(4, 8), 50).join(' '),
        symptom: sentence(draw, int(3, 7), 50).join(' '),
        summary: sentence(draw, int(10, 20)).join(' '),
        tags: [pick(slugs), pick(slugs)].filter((t, i, a) => a.indexOf(t) === i),
        content: { startStepId: 's0', steps },
      };
    });
    await db.raw(
      `insert into guide_versions (guide_id, number, state, title, symptom, summary, tags, content, created_by, updated_by, published_at)
       select x.guide_id, 1, 'published', x.title, x.symptom, x.summary, x.tags, x.content, ?, ?, now()
         from jsonb_to_recordset(?::jsonb) as x(guide_id int, title text, symptom text, summary text, tags text[], content jsonb)`,
      [author.id, author.id, JSON.stringify(rows)],
    );
    process.stdout.write(`\rguides ${start + n}/${GUIDES}`);
  }
  await db.raw(`update guides g set published_version_id = v.id from guide_versions v where v.guide_id = g.id`);
  process.stdout.write('\n');
}

/**
 * The query mix: 1 to 3 words drawn log-uniformly over the ranks (a third with a trade word),
 * kept by how many documents they match, so the typical query matches about 1% and the heaviest
 * 5% match over 10%.
 */
async function queryMix(db: Db, words: string[]) {
  const total = ARTICLES + GUIDES;
  const typical: { q: string; share: number }[] = [];
  const heavy: { q: string; share: number }[] = [];
  for (let tries = 0; tries < 20_000 && (typical.length < QUERIES || heavy.length < QUERIES / 20); tries++) {
    const n = int(1, 3);
    const q: string[] = [];
    for (let i = 0; i < n; i++) q.push(rand() < 0.33 ? pick(TRADE) : words[Math.floor(Math.exp(Math.log(20) + rand() * (Math.log(words.length) - Math.log(20)))) - 1]);
    const text = [...new Set(q)].join(' ');
    const res = await db.raw(`select count(*)::int as n from search_documents where tsv @@ websearch_to_tsquery('beadpath_english', ?)`, [text]);
    const share = res.rows[0].n / total;
    if (share >= 0.005 && share <= 0.02 && typical.length < QUERIES) typical.push({ q: text, share });
    else if (share > 0.1 && share < 0.4 && heavy.length < QUERIES / 20) heavy.push({ q: text, share });
  }
  const mix = [...typical.slice(0, QUERIES - heavy.length), ...heavy];
  for (let i = mix.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [mix[i], mix[j]] = [mix[j], mix[i]];
  }
  return mix;
}

// ---- measuring ----------------------------------------------------------------------------------

interface Figures {
  label: string;
  clients: number;
  queries: number;
  qps: number;
  mean: number;
  p50: number;
  p95: number;
}

const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];

function figures(label: string, clients: number, latencies: number[], seconds: number): Figures {
  const s = [...latencies].sort((a, b) => a - b);
  return { label, clients, queries: s.length, qps: s.length / seconds, mean: s.reduce((a, b) => a + b, 0) / s.length, p50: pct(s, 50), p95: pct(s, 95) };
}

function startApp(dbUrl: string) {
  return startServerProcess({ DATABASE_URL: dbUrl });
}

async function signIn(base: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: base },
    body: JSON.stringify({ email: 'tech@bench.invalid', password: PASSWORD }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

/** One GET over a kept-alive connection; node:http keeps the load generator's own CPU use small. */
function get(agent: Agent, base: string, path: string, cookie: string): Promise<{ status: number; body: string }> {
  const url = new URL(path, base);
  return new Promise((resolve, reject) => {
    const req = request({ agent, host: url.hostname, port: url.port, path: url.pathname + url.search, headers: { cookie } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end();
  });
}

async function loadApp(base: string, cookie: string, queries: string[], clients: number, label: string): Promise<Figures> {
  const agent = new Agent({ keepAlive: true, maxSockets: clients });
  const latencies: number[] = [];
  let next = 0;
  let wrong = 0;
  const started = performance.now();
  await Promise.all(
    Array.from({ length: clients }, async () => {
      for (let i = next++; i < queries.length; i = next++) {
        const t0 = performance.now();
        const res = await get(agent, base, `/api/search?limit=10&q=${encodeURIComponent(queries[i])}`, cookie);
        latencies.push(performance.now() - t0);
        if (res.status !== 200 || !res.body.includes('"engine":"postgres"')) wrong++;
      }
    }),
  );
  agent.destroy();
  if (wrong) throw new Error(`${wrong} searches did not answer 200 from PostgreSQL`);
  return figures(label, clients, latencies, (performance.now() - started) / 1000);
}

function pgBinDir(): string {
  if (process.env.PG_BINDIR && existsSync(join(process.env.PG_BINDIR, 'pgbench'))) return process.env.PG_BINDIR;
  const base = '/usr/lib/postgresql';
  const v = readdirSync(base)
    .filter((x) => existsSync(join(base, x, 'bin', 'pgbench')))
    .sort((a, b) => Number(b) - Number(a))[0];
  if (!v) throw new Error('pgbench was not found under /usr/lib/postgresql');
  return join(base, v, 'bin');
}

/** The textbook query: rank every match with ts_rank_cd over the full vector, headline the top 10. */
const TEXTBOOK = `\\set i random(1, ${QUERIES})
select t.id, t.title, ts_headline('beadpath_english', t.body, t.q) as snippet
  from (select d.id, d.title, d.body, x.q
          from search_documents d,
               (select websearch_to_tsquery('beadpath_english', q) as q from bench_queries where id = :i) x
         where d.tsv @@ x.q
         order by ts_rank_cd(d.tsv, x.q) desc
         limit 10) t;
`;

function pgbench(cluster: { port: number; password: string }, dbName: string, clients: number, label: string): Figures {
  const dir = mkdtempSync(join(tmpdir(), 'bench-pgbench-'));
  try {
    const script = join(dir, 'textbook.sql');
    writeFileSync(script, TEXTBOOK);
    const perClient = Math.ceil(QUERIES / clients);
    const res = spawnSync(
      join(pgBinDir(), 'pgbench'),
      [
        '-n',
        '-f',
        script,
        '-c',
        String(clients),
        '-j',
        String(Math.min(clients, 2)),
        '-t',
        String(perClient),
        '-l',
        `--log-prefix=${join(dir, 'tx')}`,
        '-h',
        '127.0.0.1',
        '-p',
        String(cluster.port),
        '-U',
        'app',
        dbName,
      ],
      { encoding: 'utf8', env: { ...process.env, PGPASSWORD: cluster.password }, cwd: dir },
    );
    if (res.status !== 0) throw new Error(`pgbench failed: ${res.stderr || res.stdout}`);
    const tps = Number(/tps = ([\d.]+) \(without initial connection time\)/.exec(res.stdout)?.[1]);
    const latencies: number[] = [];
    for (const f of readdirSync(dir).filter((x) => x.startsWith('tx.'))) {
      for (const line of readFileSync(join(dir, f), 'utf8').split('\n')) {
        const cols = line.trim().split(/\s+/);
        if (cols.length >= 3) latencies.push(Number(cols[2]) / 1000);
      }
    }
    const f = figures(label, clients, latencies, latencies.length / tps);
    return { ...f, qps: tps };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// ---- the run ------------------------------------------------------------------------------------

const fmt = (n: number, d = 1) => n.toFixed(d).padStart(8);

const TICK_MS = 1000 / Number(spawnSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).stdout.trim() || 100);

/** User + system CPU of one process, in ms (Linux /proc). */
function cpuOf(pid: number): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return (Number(fields[11]) + Number(fields[12])) * TICK_MS;
  } catch {
    return 0;
  }
}

async function cpuSnapshot(db: Db, dbName: string, appPid: number) {
  const backends = await db.raw('select pid from pg_stat_activity where datname = ? and pid <> pg_backend_pid()', [dbName]);
  return { app: cpuOf(appPid), pg: new Map<number, number>(backends.rows.map((r: { pid: number }) => [r.pid, cpuOf(r.pid)])) };
}

async function main() {
  const cluster = await ensureCluster({ name: 'pg-test', durable: false, log: () => {} });
  const dbName = `bench_search_${randomBytes(4).toString('hex')}`;
  ensureDatabase(cluster, dbName);
  const dbUrl = cluster.urlFor(dbName);
  const db = createDb(dbUrl, { max: 4 });
  let app: ChildProcess | null = null;
  try {
    console.log(`Database ${dbName} in the test cluster (port ${cluster.port}).`);
    await migrateLatest(db);
    const words = await vocabulary(db);
    let t = performance.now();
    await buildCorpus(db, words);
    console.log(`corpus inserted in ${((performance.now() - t) / 1000).toFixed(1)} s`);
    t = performance.now();
    await syncSearch(db);
    await db.raw('vacuum analyze');
    console.log(`search documents built and indexed in ${((performance.now() - t) / 1000).toFixed(1)} s`);
    const docs = await db('search_documents').count('* as n').first();
    const avgWords = await db.raw(`select round(avg(array_length(regexp_split_to_array(body, '\\s+'), 1))) as n from search_documents where kind = 'article'`);

    const mix = await queryMix(db, words);
    await db.schema.createTable('bench_queries', (tb) => {
      tb.integer('id').primary();
      tb.text('q').notNullable();
    });
    await db('bench_queries').insert(mix.map((m, i) => ({ id: i + 1, q: m.q })));
    const shares = mix.map((m) => m.share * 100).sort((a, b) => a - b);
    console.log(
      `${docs?.n} documents (articles average ${avgWords.rows[0].n} words); ${mix.length} queries, matching median ${pct(shares, 50).toFixed(2)}% and p95 ${pct(shares, 95).toFixed(1)}% of documents`,
    );
    console.log(
      `examples: ${mix
        .slice(0, 6)
        .map((m) => `"${m.q}"`)
        .join(', ')}`,
    );

    // Like `npm start`, the app reaches PostgreSQL through the cluster's Unix socket; BENCH_PG_TCP=1 uses loopback TCP.
    const appDbUrl = process.env.BENCH_PG_TCP === '1' ? dbUrl : cluster.localUrlFor(dbName);
    const started = await startApp(appDbUrl);
    app = started.child;
    const cookie = await signIn(started.base);
    const queries = mix.map((m) => m.q);
    // One unmeasured pass warms both the app and PostgreSQL's caches for every measured run.
    await loadApp(started.base, cookie, queries, 4, 'warm-up');
    pgbench(cluster, dbName, 4, 'warm-up');

    const results: Figures[] = [];
    // CPU time per request (app process + this database's PostgreSQL backends): a figure that holds
    // still while other work shares the machine, unlike latencies.
    const cpu0 = await cpuSnapshot(db, dbName, app.pid!);
    results.push(await loadApp(started.base, cookie, queries, 16, '/api/search (app, HTTP + session)'));
    const cpu1 = await cpuSnapshot(db, dbName, app.pid!);
    results.push(pgbench(cluster, dbName, 16, 'textbook query (pgbench)'));
    results.push(await loadApp(started.base, cookie, queries, 4, '/api/search (app, HTTP + session)'));
    results.push(pgbench(cluster, dbName, 4, 'textbook query (pgbench)'));

    console.log('\nwhat                                 clients queries      q/s  mean ms   p50 ms   p95 ms');
    for (const r of results) console.log(`${r.label.padEnd(37)}${String(r.clients).padStart(7)}${String(r.queries).padStart(8)}${fmt(r.qps)}${fmt(r.mean)}${fmt(r.p50)}${fmt(r.p95)}`);
    const [app16, tb16, app4] = results;
    const checks = [
      [`app throughput at 16 clients >= textbook (${app16.qps.toFixed(0)} vs ${tb16.qps.toFixed(0)} q/s)`, app16.qps >= tb16.qps],
      [`app p95 at 16 clients < 100 ms (${app16.p95.toFixed(1)} ms)`, app16.p95 < 100],
      [`app p95 at 4 clients < 50 ms (${app4.p95.toFixed(1)} ms)`, app4.p95 < 50],
    ] as const;
    const appMs = (cpu1.app - cpu0.app) / queries.length;
    const pgMs = [...cpu1.pg].reduce((sum, [pid, t]) => sum + t - (cpu0.pg.get(pid) ?? 0), 0) / queries.length;
    console.log(
      `\nCPU per search at 16 clients: app ${appMs.toFixed(2)} ms, PostgreSQL ${pgMs.toFixed(2)} ms, together ${(appMs + pgMs).toFixed(2)} ms (2 cores: ceiling about ${(2000 / (appMs + pgMs)).toFixed(0)} q/s)`,
    );
    console.log('');
    for (const [what, ok] of checks) console.log(`${ok ? 'met    ' : 'MISSED '} ${what}`);
  } finally {
    app?.kill('SIGTERM');
    await db.destroy();
    // BENCH_KEEP=1 keeps the corpus for looking at query plans afterwards.
    if (process.env.BENCH_KEEP === '1') console.log(`\nDatabase ${dbName} kept (BENCH_KEEP=1); drop it when done.`);
    else {
      dropDatabase(cluster, dbName);
      console.log(`\nDatabase ${dbName} dropped.`);
    }
  }
}

await main();
