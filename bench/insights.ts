// `npm run bench:insights`: seeds 1,000,000 walks and 200,000 service events over 2,000 applicators
// in its own database of the test cluster, times a full refresh of the summary tables, then each
// insights query through the service the routes use (checking each answer against the exact one
// read from the raw history), then an incremental refresh after a day's new walks and services.
// Prints the figures and drops the database. Not part of `npm test`.
import { randomBytes } from 'node:crypto';
import { register } from 'tsx/esm/api';
import { createDb, migrateLatest, type Db } from '../server/db/knex';
import { createInsightsService } from '../server/modules/insights/insights.service';
import { CausesQuery, ForecastQuery, GuidesQuery, ReliabilityQuery } from '../src/shared/schemas/insights';
import type { SessionUser } from '../src/shared/schemas/auth';
import { dropDatabase, ensureCluster, ensureDatabase } from '../scripts/lib/cluster';

// Knex loads the .ts migrations through Node's own loader.
register();

const APPLICATORS = 2_000;
const WALKS = 1_000_000;
const SERVICES = 200_000;
const GUIDES = 60;
const CAUSES = 30;
const RUNS = 5;
const TARGET_MS = 300;

const days = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
/** The answer without its freshness stamp and with keys in one order (stored answers come back from jsonb). */
function canonical(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(canonical);
  if (v && typeof v === 'object')
    return Object.fromEntries(
      Object.keys(v)
        .filter((k) => k !== 'asOf')
        .sort()
        .map((k) => [k, canonical((v as Record<string, unknown>)[k])]),
    );
  return v;
}

async function seed(db: Db): Promise<number> {
  const [org] = await db('organisations').insert({ name: 'Bench works' }).returning('id');
  const o = org.id as number;
  const [user] = await db('users')
    .insert({ organisation_id: o, email: 'bench@example.com', name: 'Bench', roles: ['manager'] })
    .returning('id');
  await db.raw(`insert into causes (organisation_id, code, label) select ?, 'cause-' || i, 'Cause ' || i from generate_series(1, ?) i`, [o, CAUSES]);
  await db.raw(`insert into sites (organisation_id, name) select ?, 'Site ' || i from generate_series(1, 10) i`, [o]);
  await db.raw(`insert into lines (organisation_id, site_id, name) select s.organisation_id, s.id, 'Line ' || i from sites s cross join generate_series(1, 5) i where s.organisation_id = ?`, [o]);
  // Applicators spread over the 50 lines; a third air-operated; rates of 20–120 cycles a minute.
  await db.raw(
    `insert into applicators (organisation_id, site_id, line_id, tag, actuation, fluid_family, installed_on, cycles_per_minute, hours_per_day, days_per_week)
     select ?, l.site_id, l.id, 'B-' || i, case when i % 3 = 0 then 'air-operated' else 'electric' end,
            (array['hot-melt','cold-glue','silicone','epoxy'])[1 + i % 4], current_date - 800, 20 + (i % 100), 16, 5
       from generate_series(1, ?) i
       join (select id, site_id, row_number() over (order by id) - 1 as n from lines where organisation_id = ?) l on l.n = i % 50`,
    [o, APPLICATORS, o],
  );
  // Monthly counter readings for two years, with a counter reset on every 40th applicator.
  await db.raw(
    `insert into counter_readings (organisation_id, applicator_id, read_on, count, counter_reset)
     select a.organisation_id, a.id, current_date - 30 * m,
            case when a.id % 40 = 0 and m < 6 then (6 - m) * a.cycles_per_minute * 60 * 16 * 22 else (25 - m) * a.cycles_per_minute * 60 * 16 * 22 end,
            a.id % 40 = 0 and m = 5
       from applicators a cross join generate_series(0, 24) m where a.organisation_id = ?`,
    [o],
  );
  await db.raw(`insert into guides (organisation_id, status) select ?, 'active' from generate_series(1, ?)`, [o, GUIDES]);
  await db.raw(
    `insert into guide_versions (guide_id, number, state, title, symptom, content, published_at)
     select id, 1, 'published', 'Guide ' || id, 'Symptom ' || id,
            '{"steps":[{"id":"s1","title":"First check"},{"id":"s2","title":"Second check"},{"id":"s3","title":"Measure"}]}'::jsonb, now()
       from guides where organisation_id = ?`,
    [o],
  );
  await db.raw(`update guides g set published_version_id = v.id from guide_versions v where v.guide_id = g.id and g.organisation_id = ?`, [o]);
  const t = performance.now();
  // Walks over two years: 70 % end at a Finding with a cause, the rest hand-offs, abandoned or open.
  await db.raw(
    `insert into walks (organisation_id, guide_id, guide_version_id, user_id, applicator_id, status, end_kind, outcome, cause_code, ended_at_step_id, started_at, ended_at)
     select ?, g.guide_id, g.version_id, ?, a0 + ((i::bigint * 7919) % ?)::int,
            case when r < 0.70 then 'ended' when r < 0.80 then 'ended' when r < 0.95 then 'abandoned' else 'open' end,
            case when r < 0.70 then 'finding' when r < 0.80 then 'handoff' when r < 0.95 then 'abandoned' end,
            case when r < 0.55 then 'fixed' when r < 0.65 then 'not-fixed' when r < 0.70 then 'fixed-by-other' end,
            case when r < 0.70 then 'cause-' || (1 + floor(power(random(), 2) * ?)::int) end,
            case when r >= 0.80 and r < 0.95 then 's' || (1 + i % 3) end,
            st, case when r < 0.95 then st + make_interval(mins => 10 + (i % 50)) end
       from (select i, random() as r, now() - make_interval(mins => (random() * 730 * 1440)::int) as st from generate_series(1, ?) i) x
       cross join lateral (select min(id) as a0 from applicators where organisation_id = ?) a
       join (select g.id as guide_id, v.id as version_id, row_number() over (order by g.id) - 1 as n from guides g join guide_versions v on v.guide_id = g.id where g.organisation_id = ?) g on g.n = x.i % ?`,
    [o, user.id, APPLICATORS, CAUSES, WALKS, o, o, GUIDES],
  );
  await db.raw(
    `insert into service_events (organisation_id, applicator_id, performed_on, actions, cause_code, parts)
     select ?, a0 + ((i::bigint * 104729) % ?)::int, current_date - (random() * 720)::int,
            case i % 6 when 0 then array['seat-replaced'] when 1 then array['needle-replaced'] when 2 then array['seals-replaced']
              when 3 then array['cleaned'] when 4 then array['coil-replaced'] else array['seat-replaced','needle-replaced'] end,
            case when random() < 0.5 then 'cause-' || (1 + floor(power(random(), 2) * ?)::int) end,
            '[{"name":"Seat kit","partNumber":"SK-1","quantity":1}]'::jsonb
       from generate_series(1, ?) i cross join lateral (select min(id) as a0 from applicators where organisation_id = ?) a`,
    [o, APPLICATORS, CAUSES, SERVICES, o],
  );
  console.log(`walks and service events inserted in ${((performance.now() - t) / 1000).toFixed(1)} s`);
  await db.raw('vacuum analyze');
  return o;
}

async function main() {
  const cluster = await ensureCluster({ name: 'pg-test', durable: false, log: () => {} });
  // BENCH_DB=<name> reuses a database kept by an earlier run (BENCH_KEEP=1), skipping the seed.
  const reuse = process.env.BENCH_DB;
  const dbName = reuse ?? `bench_insights_${randomBytes(4).toString('hex')}`;
  if (!reuse) ensureDatabase(cluster, dbName);
  const db = createDb(cluster.urlFor(dbName), { max: 6 });
  try {
    console.log(`Database ${dbName} in the test cluster (port ${cluster.port}).`);
    await migrateLatest(db);
    const organisationId = reuse ? ((await db('organisations').where({ name: 'Bench works' }).first('id')).id as number) : await seed(db);
    const counts = await db.raw(
      `select (select count(*) from walks) as walks, (select count(*) from service_events) as services, (select count(*) from applicators) as applicators, (select count(*) from counter_readings) as readings`,
    );
    const c = counts.rows[0];
    console.log(`${c.walks} walks, ${c.services} service events, ${c.applicators} applicators, ${c.readings} counter readings`);
    const s = createInsightsService({ db });
    const user = { id: 1, organisationId, roles: ['manager'] } as unknown as SessionUser;
    let t = performance.now();
    const full = await s.refresh(organisationId, { full: true });
    console.log(`full refresh of the summary tables: ${((performance.now() - t) / 1000).toFixed(1)} s (steps in ms: ${JSON.stringify(full.steps)})`);
    await db.raw('analyze');
    const site = await db('sites').where({ organisation_id: organisationId }).first('id');
    const cases: [string, () => Promise<unknown>, () => Promise<unknown>][] = [
      ['causes: a year, all, repeats within 90 d, by month', () => s.causes(user, CausesQuery.parse({})), () => s.exact.causes(organisationId, CausesQuery.parse({}))],
      [
        'causes: 6 months, all, repeats within 30 d, by week',
        () => s.causes(user, CausesQuery.parse({ from: days(-182), repeatDays: 30, bucket: 'week' })),
        () => s.exact.causes(organisationId, CausesQuery.parse({ from: days(-182), repeatDays: 30, bucket: 'week' })),
      ],
      [
        'causes: a year, one site, electric, by week',
        () => s.causes(user, CausesQuery.parse({ siteId: site.id, actuation: 'electric', bucket: 'week' })),
        () => s.exact.causes(organisationId, CausesQuery.parse({ siteId: site.id, actuation: 'electric', bucket: 'week' })),
      ],
      [
        'causes: two years, one guide',
        () => s.causes(user, CausesQuery.parse({ guideId: 1, from: days(-730) })),
        () => s.exact.causes(organisationId, CausesQuery.parse({ guideId: 1, from: days(-730) })),
      ],
      ['forecast: next 90 days, all sites', () => s.forecast(user, ForecastQuery.parse({})), () => s.exact.forecast(organisationId, ForecastQuery.parse({}))],
      [
        'forecast: next 30 days, one site',
        () => s.forecast(user, ForecastQuery.parse({ days: 30, siteId: site.id })),
        () => s.exact.forecast(organisationId, ForecastQuery.parse({ days: 30, siteId: site.id })),
      ],
      ['guides: a year, every version', () => s.guides(user, GuidesQuery.parse({})), () => s.exact.guides(organisationId, GuidesQuery.parse({}))],
      ['reliability: seat', () => s.reliability(user, ReliabilityQuery.parse({ part: 'seat' })), () => s.exact.reliability(organisationId, ReliabilityQuery.parse({ part: 'seat' }))],
      ['reliability: seals (air-operated)', () => s.reliability(user, ReliabilityQuery.parse({ part: 'seals' })), () => s.exact.reliability(organisationId, ReliabilityQuery.parse({ part: 'seals' }))],
      [
        'reliability: needle, electric',
        () => s.reliability(user, ReliabilityQuery.parse({ part: 'needle', actuation: 'electric' })),
        () => s.exact.reliability(organisationId, ReliabilityQuery.parse({ part: 'needle', actuation: 'electric' })),
      ],
    ];
    console.log(`\n${'query'.padEnd(52)}  median ms    max ms  exact ms  same answer (${RUNS} runs after one warm-up)`);
    const missed: string[] = [];
    const different: string[] = [];
    for (const [label, run, exact] of cases) {
      const first = await run();
      t = performance.now();
      const reference = await exact();
      const exactMs = performance.now() - t;
      const same = JSON.stringify(canonical(first)) === JSON.stringify(canonical(reference));
      if (!same) different.push(label);
      const times: number[] = [];
      for (let i = 0; i < RUNS; i++) {
        const t = performance.now();
        await run();
        times.push(performance.now() - t);
      }
      times.sort((a, b) => a - b);
      const median = times[Math.floor(RUNS / 2)];
      if (median >= TARGET_MS) missed.push(label);
      console.log(`${label.padEnd(52)}${median.toFixed(1).padStart(11)}${times[RUNS - 1].toFixed(1).padStart(10)}${exactMs.toFixed(0).padStart(10)}  ${same ? 'yes' : 'NO'}`);
    }
    console.log(missed.length ? `\nMISSED the ${TARGET_MS} ms target: ${missed.join('; ')}` : `\nmet: every query's median under ${TARGET_MS} ms`);
    console.log(different.length ? `DIFFERENT from the exact answer: ${different.join('; ')}` : 'every answer equals the exact one read from the raw history');

    // A day's new work, then the refreshes the queue would run: 1,500 walks ending today (causes and
    // guides only), then 300 services (which also recompute the stored forecast and reliability).
    await db.raw(
      `insert into walks (organisation_id, guide_id, guide_version_id, user_id, applicator_id, status, end_kind, outcome, cause_code, started_at, ended_at)
       select w.organisation_id, w.guide_id, w.guide_version_id, w.user_id, w.applicator_id, 'ended', 'finding', 'fixed', w.cause_code, now() - interval '20 minutes', now()
         from walks w where w.organisation_id = ? and w.end_kind = 'finding' limit 1500`,
      [organisationId],
    );
    t = performance.now();
    const walksOnly = await s.refresh(organisationId);
    console.log(
      `\nincremental refresh after 1,500 walks: ${(performance.now() - t).toFixed(0)} ms (${walksOnly.days} days, ${walksOnly.applicators} applicators; steps in ms: ${JSON.stringify(walksOnly.steps)})`,
    );
    await db.raw(
      `insert into service_events (organisation_id, applicator_id, performed_on, actions, cause_code, parts)
       select organisation_id, applicator_id, current_date, actions, cause_code, parts from service_events where organisation_id = ? limit 300`,
      [organisationId],
    );
    t = performance.now();
    const inc = await s.refresh(organisationId);
    console.log(
      `incremental refresh after 300 services: ${(performance.now() - t).toFixed(0)} ms (${inc.days} days, ${inc.applicators} applicators${inc.snapshots ? ', forecast and reliability recomputed' : ''}; steps in ms: ${JSON.stringify(inc.steps)})`,
    );
    const after = await s.causes(user, CausesQuery.parse({}));
    const afterExact = await s.exact.causes(organisationId, CausesQuery.parse({}));
    console.log(`causes after the incremental refresh equal the exact answer: ${JSON.stringify(canonical(after)) === JSON.stringify(canonical(afterExact)) ? 'yes' : 'NO'}`);
  } finally {
    await db.destroy();
    if (process.env.BENCH_KEEP === '1' || reuse) console.log(`\nDatabase ${dbName} kept (BENCH_KEEP=1); drop it when done.`);
    else {
      dropDatabase(cluster, dbName);
      console.log(`\nDatabase ${dbName} dropped.`);
    }
  }
}

await main();
