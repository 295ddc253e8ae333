// Insights from the summary tables over a real database: after a refresh every organisation-wide
// answer equals the one read from the raw history; the triggers mark new walks, services and
// counters so an incremental refresh catches up; the job queue refreshes on request; the
// organisation's default intervals move forecast dates; the Weibull fit through the endpoint is
// the maximum of the likelihood built with @stdlib's Weibull CDF; and what cannot be computed is
// said in words with the summaries too.
import weibullCdf from '@stdlib/stats-base-dists-weibull-cdf';
import weibullQuantile from '@stdlib/stats-base-dists-weibull-quantile';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { localToday } from '../../src/shared/schemas/assets';
import { CausesQuery, ForecastQuery, GuidesQuery, ReliabilityQuery, RELIABILITY_PARTS } from '../../src/shared/schemas/insights';
import type { InsightsService } from '../../server/modules/insights/insights.service';
import type { InsightsJobs } from '../../server/modules/insights/insights.jobs';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let manager: Agent;
let admin: Agent;
let userId: number;
let guideId: number;
let versionId: number;
let siteId: number;
let lineId: number;
let service: InsightsService;
let jobs: InsightsJobs;

const today = localToday();
const shift = (date: string, days: number) => new Date(Date.parse(`${date}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
const at = (days: number, extraMs = 0) => new Date(Date.parse(`${shift(today, -days)}T10:00:00Z`) + extraMs).toISOString();
let tagNo = 0;

async function applicator(extra: Record<string, unknown> = {}) {
  const [a] = await t
    .db('applicators')
    .insert({ organisation_id: t.organisationId, site_id: siteId, line_id: lineId, tag: `S-${++tagNo}`, actuation: 'electric', status: 'running', ...extra })
    .returning(['id', 'tag']);
  return a as { id: number; tag: string };
}

async function walk(extra: Record<string, unknown>) {
  const [w] = await t
    .db('walks')
    .insert({ organisation_id: t.organisationId, guide_id: guideId, guide_version_id: versionId, user_id: userId, ...extra })
    .returning('id');
  return w.id as number;
}

async function serviceEvent(applicatorId: number, extra: Record<string, unknown>) {
  const [e] = await t
    .db('service_events')
    .insert({ organisation_id: t.organisationId, applicator_id: applicatorId, actions: ['cleaned'], ...extra })
    .returning('id');
  return e.id as number;
}

async function reading(applicatorId: number, readOn: string, count: number, counterReset = false) {
  const [r] = await t.db('counter_readings').insert({ organisation_id: t.organisationId, applicator_id: applicatorId, read_on: readOn, count, counter_reset: counterReset }).returning('id');
  return r.id as number;
}

/** Key order and the freshness stamp aside (stored answers come back from jsonb). */
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

const user = () => ({ id: userId, organisationId: t.organisationId, roles: ['manager'] }) as never;

const QUESTIONS = {
  causes: () => [
    CausesQuery.parse({}),
    CausesQuery.parse({ repeatDays: 30, bucket: 'week' }),
    CausesQuery.parse({ from: shift(today, -200), repeatDays: 365 }),
    CausesQuery.parse({ from: shift(today, -60), to: shift(today, -5), repeatDays: 1 }),
    // Filters on the applicator read the chains.
    CausesQuery.parse({ actuation: 'air-operated', from: shift(today, -500) }),
    CausesQuery.parse({ siteId, lineId, actuation: 'electric', bucket: 'week', repeatDays: 45 }),
  ],
  guides: [GuidesQuery.parse({}), GuidesQuery.parse({ from: shift(today, -5), to: today })],
  forecast: [30, 60, 90].map((days) => ForecastQuery.parse({ days })),
  reliability: RELIABILITY_PARTS.flatMap((part) => [undefined, 'electric', 'air-operated'].map((actuation) => ReliabilityQuery.parse({ part, actuation }))),
};

/** Every organisation-wide question, from the summaries and from the raw history. */
async function compareAll() {
  for (const q of QUESTIONS.causes()) {
    const fast = await service.causes(user(), q);
    expect(fast.asOf, 'causes read the summaries').not.toBeNull();
    expect(canonical(fast), `causes ${JSON.stringify(q)}`).toEqual(canonical(await service.exact.causes(t.organisationId, q)));
  }
  for (const q of QUESTIONS.guides) {
    const fast = await service.guides(user(), q);
    expect(fast.asOf).not.toBeNull();
    expect(canonical(fast), `guides ${JSON.stringify(q)}`).toEqual(canonical(await service.exact.guides(t.organisationId, q)));
  }
  for (const q of QUESTIONS.forecast) {
    const fast = await service.forecast(user(), q);
    expect(fast.asOf).not.toBeNull();
    expect(canonical(fast), `forecast ${q.days}`).toEqual(canonical(await service.exact.forecast(t.organisationId, q)));
  }
  for (const q of QUESTIONS.reliability) {
    const fast = await service.reliability(user(), q);
    expect(fast.asOf).not.toBeNull();
    expect(canonical(fast), `reliability ${JSON.stringify(q)}`).toEqual(canonical(await service.exact.reliability(t.organisationId, q)));
  }
}

beforeAll(async () => {
  t = await startTestApp();
  service = t.app.locals.insights.service;
  jobs = t.app.locals.insights.jobs;
  const signed = await t.signIn(['manager']);
  manager = signed.agent;
  userId = signed.user.id;
  admin = (await t.signIn(['admin'])).agent;
  [guideId, versionId] = await t.db.transaction(async (trx) => {
    const [g] = await trx('guides').insert({ organisation_id: t.organisationId, status: 'active' }).returning('id');
    const [v] = await trx('guide_versions')
      .insert({
        guide_id: g.id,
        number: 1,
        state: 'published',
        title: SAMPLE_GUIDE_META.title,
        symptom: SAMPLE_GUIDE_META.symptom,
        tags: SAMPLE_GUIDE_META.tags,
        content: JSON.stringify(SAMPLE_GUIDE),
        published_at: trx.fn.now(),
      })
      .returning('id');
    await trx('guides').where({ id: g.id }).update({ published_version_id: v.id });
    return [g.id as number, v.id as number];
  });
  await t.db('causes').insert([
    { organisation_id: t.organisationId, code: 'seat-worn', label: 'Worn seat' },
    { organisation_id: t.organisationId, code: 'nozzle-blocked', label: 'Blocked nozzle' },
  ]);
  const [s] = await t.db('sites').insert({ organisation_id: t.organisationId, name: 'Plant S' }).returning('id');
  siteId = s.id;
  const [l] = await t.db('lines').insert({ organisation_id: t.organisationId, site_id: siteId, name: 'Line 1' }).returning('id');
  lineId = l.id;
});

afterAll(async () => t?.close());

describe('summary tables', () => {
  let a: { id: number; tag: string };
  let b: { id: number; tag: string };

  it('when hand-made history is refreshed, then every organisation-wide answer equals the exact one and says as of when', async () => {
    const rate = { cycles_per_minute: 100, hours_per_day: 10, days_per_week: 7, installed_on: shift(today, -1000) };
    a = await applicator({ ...rate, seat_interval_cycles: 57_030_000 });
    b = await applicator({ ...rate, actuation: 'air-operated' });
    const step = SAMPLE_GUIDE.steps[1] as { id: string };
    // Worn seat on A: 100 and 60 days ago, twice on the day 60 days ago (a walk and an unlinked service), and 10 days ago.
    await walk({ applicator_id: a.id, status: 'ended', end_kind: 'finding', outcome: 'fixed', cause_code: 'seat-worn', started_at: at(100, -600_400), ended_at: at(100) });
    const linked = await walk({ applicator_id: a.id, status: 'ended', end_kind: 'finding', outcome: 'not-fixed', cause_code: 'seat-worn', started_at: at(60, -1_234_567), ended_at: at(60) });
    await serviceEvent(a.id, { performed_on: shift(today, -60), cause_code: 'seat-worn', actions: ['seat-replaced'], walk_id: linked });
    await serviceEvent(a.id, { performed_on: shift(today, -60), cause_code: 'seat-worn', actions: ['seat-replaced'], parts: JSON.stringify([{ name: 'Seat kit', partNumber: 'SK-9', quantity: 1 }]) });
    await serviceEvent(a.id, { performed_on: shift(today, -10), cause_code: 'seat-worn' });
    // On B: a blocked nozzle 400 days ago (outside a year) and 350 days ago, so its pair straddles the period's start.
    await serviceEvent(b.id, { performed_on: shift(today, -400), cause_code: 'nozzle-blocked' });
    await serviceEvent(b.id, { performed_on: shift(today, -350), cause_code: 'nozzle-blocked' });
    // A Finding on no applicator counts in the Pareto but cannot repeat.
    await walk({ status: 'ended', end_kind: 'finding', outcome: 'fixed-by-other', cause_code: 'nozzle-blocked', started_at: at(3, -900_000), ended_at: at(3) });
    await walk({ applicator_id: b.id, status: 'abandoned', end_kind: 'abandoned', ended_at_step_id: step.id, started_at: at(2), ended_at: at(2, 60_000) });
    await walk({ applicator_id: b.id, status: 'open', current_step_id: step.id, started_at: at(1) });
    // Counters for the forecast and reliability: A renewed its seat 900 days ago, B has readings.
    await serviceEvent(a.id, { performed_on: shift(today, -900), actions: ['seat-replaced'], parts: JSON.stringify([{ name: 'Seat kit', partNumber: 'SK-9', quantity: 1 }]) });
    await reading(b.id, shift(today, -200), 1_000_000);
    await reading(b.id, shift(today, -20), 9_000_000);
    await serviceEvent(b.id, { performed_on: shift(today, -100), actions: ['seals-replaced'], cause_code: 'seals-leaking', reading_id: await reading(b.id, shift(today, -100), 5_000_000) });

    expect((await service.status(t.organisationId)).refreshedAt).toBeNull();
    const before = await service.causes(user(), CausesQuery.parse({}));
    expect(before.asOf, 'before the first refresh the raw history is read').toBeNull();

    const r = await service.refresh(t.organisationId);
    expect(r.full).toBe(true);
    expect(await t.db('insight_dirty').where({ organisation_id: t.organisationId }).count('* as n').first()).toMatchObject({ n: '0' });
    await compareAll();

    const causes = await service.causes(user(), CausesQuery.parse({ repeatDays: 90 }));
    // The linked service is the walk's failure counted once: worn seat 4 (walk, walk, service, service), blocked nozzle 2 in the year.
    expect(causes.pareto.map((p) => [p.code, p.count])).toEqual([
      ['seat-worn', 4],
      ['nozzle-blocked', 2],
      ['seals-leaking', 1],
    ]);
    expect(causes.repeats.map((x) => [x.tag, x.firstOn, x.repeatOn, x.daysApart])).toEqual([
      [a.tag, shift(today, -60), shift(today, -10), 50],
      [a.tag, shift(today, -100), shift(today, -60), 40],
      [a.tag, shift(today, -60), shift(today, -60), 0],
    ]);
    expect(causes.repeatTotal).toBe(3);
  });

  it('when walks end, services are written, and a walk is given up after the refresh, then the triggers mark them and an incremental refresh catches up', async () => {
    const refreshed = (await service.status(t.organisationId)).refreshedAt!;
    await walk({ applicator_id: b.id, status: 'ended', end_kind: 'finding', outcome: 'fixed', cause_code: 'nozzle-blocked', started_at: at(0, -300_000), ended_at: at(0) });
    const open = await t.db('walks').where({ organisation_id: t.organisationId, status: 'open' }).first('id');
    await t
      .db('walks')
      .where({ id: open.id })
      .update({ status: 'abandoned', end_kind: 'abandoned', ended_at: t.db.fn.now(), ended_at_step_id: (SAMPLE_GUIDE.steps[2] as { id: string }).id });
    await t
      .db('service_events')
      .where({ applicator_id: b.id, performed_on: shift(today, -350) })
      .delete();
    await reading(a.id, today, 60_000_000);

    const status = await service.status(t.organisationId);
    expect(status.changesWaiting).toBe(true);
    // Until the refresh the figures stay as of the last one.
    const stale = await service.causes(user(), CausesQuery.parse({}));
    expect(stale.asOf).toBe(refreshed);
    expect(stale.total).toBe(7);

    const r = await service.refresh(t.organisationId);
    expect(r).toMatchObject({ full: false, snapshots: true });
    expect(r.days).toBeGreaterThan(0);
    await compareAll();
    const fresh = await service.causes(user(), CausesQuery.parse({}));
    expect(fresh.total).toBe(7);
    expect(fresh.pareto.find((p) => p.code === 'nozzle-blocked')!.count).toBe(2);
    expect(Date.parse(fresh.asOf!)).toBeGreaterThan(Date.parse(refreshed));
  });

  it('when the period is empty or the history cannot give a fit, then the summaries answer with the reasons, never NaN', async () => {
    const empty = await manager.get('/api/insights/causes').query({ from: '2001-01-01', to: '2001-12-31' });
    expect(empty.body.asOf).not.toBeNull();
    expect(empty.body.pareto).toEqual([]);
    expect(empty.body.empty).toMatch(/nothing to rank/);
    const guides = await manager.get('/api/insights/guides').query({ from: '2001-01-01', to: '2001-12-31' });
    expect(guides.body).toMatchObject({ versions: [] });
    expect(guides.body.asOf).not.toBeNull();
    const coil = await manager.get('/api/insights/reliability').query({ part: 'coil' });
    expect(coil.body.asOf).not.toBeNull();
    expect(coil.body.cannotFit).toMatch(/intervals ended without a failure/);
    const seals = await manager.get('/api/insights/reliability').query({ part: 'seals' });
    expect(seals.body.cannotFit).toMatch(/Only one failure/);
    expect(JSON.stringify([empty.body, guides.body, coil.body, seals.body])).not.toContain('NaN');
  });
});

describe('refresh through the job queue', () => {
  it('when a manager asks for a refresh, then a queued job runs it and the status shows the new time', async () => {
    await jobs.start();
    const before = await manager.get('/api/insights/status');
    expect(before.status).toBe(200);
    await walk({ applicator_id: null, status: 'ended', end_kind: 'finding', outcome: 'fixed', cause_code: 'seat-worn', started_at: at(0, -60_000), ended_at: at(0) });
    expect((await manager.get('/api/insights/status')).body.changesWaiting).toBe(true);
    const asked = await manager.post('/api/insights/refresh');
    expect(asked.status).toBe(202);
    const until = Date.now() + 20_000;
    let now = asked.body;
    while (Date.now() < until) {
      now = (await manager.get('/api/insights/status')).body;
      if (now.refreshedAt !== before.body.refreshedAt && !now.changesWaiting) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    expect(Date.parse(now.refreshedAt)).toBeGreaterThan(Date.parse(before.body.refreshedAt));
    expect(now).toMatchObject({ changesWaiting: false, requestedAt: null });
    // Two requests while one waits collapse into one queued job.
    const jobsQueued = async () =>
      Number((await t.db.raw(`select count(*) as n from pgboss.job where name = 'insights-refresh' and state in ('created', 'retry') and singleton_key = ?`, [`org:${t.organisationId}`])).rows[0].n);
    await jobs.stop();
    jobs = t.app.locals.insights.jobs;
    expect(await jobsQueued()).toBe(0);
  }, 40_000);
});

describe('organisation default intervals', () => {
  it('when the admin changes the default seat interval, then forecast dates, the applicator page and the reliability comparison follow it', async () => {
    // 100 cycles/min × 10 h × 7/7 = 60,000 cycles a day; seat renewed 900 days after installation at 6 M → 54 M since.
    const c = await applicator({ cycles_per_minute: 100, hours_per_day: 10, days_per_week: 7, installed_on: shift(today, -1000) });
    await serviceEvent(c.id, { performed_on: shift(today, -900), actions: ['seat-replaced'] });
    const seatRow = async () =>
      (await manager.get('/api/insights/forecast').query({ days: 90 })).body.rows.find((r: { applicatorId: number; part: string }) => r.applicatorId === c.id && r.part === 'seat');
    await service.refresh(t.organisationId);
    // Common practice, 100 M: 46 M to go at 60,000 a day is 766 days away.
    expect(await seatRow()).toBeUndefined();

    const set = async (seatCycles: number) => {
      const res = await admin.patch('/api/admin/settings').send({ serviceIntervals: { seatCycles, needleCycles: 400_000_000, sealsCycles: 30_000_000 } });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      await service.refresh(t.organisationId);
    };
    await set(55_230_000); // 1.23 M to go → 20.5 days
    expect(await seatRow()).toMatchObject({ dueOn: shift(today, 20), daysRemaining: 20, threshold: 55_230_000 });
    await set(57_030_000); // 3.03 M to go → 50.5 days
    expect(await seatRow()).toMatchObject({ dueOn: shift(today, 50), daysRemaining: 50, threshold: 57_030_000 });
    const forecast = await manager.get('/api/insights/forecast').query({ days: 90 });
    expect(forecast.body.defaultIntervals).toEqual({ seat: 57_030_000, needle: 400_000_000, seals: 30_000_000, source: 'organisation' });

    const page = await manager.get(`/api/applicators/${c.id}`);
    expect(page.status).toBe(200);
    expect(page.body.applicator.forecasts.find((f: { part: string }) => f.part === 'seat')).toMatchObject({ threshold: 57_030_000, thresholdSource: 'organisation', dueOn: shift(today, 50) });

    const rel = await manager.get('/api/insights/reliability').query({ part: 'needle' });
    expect(rel.body.planned).toMatchObject({ cycles: 400_000_000, sourceKind: 'organisation' });
    expect(rel.body.planned.source).toMatch(/organisation’s default/);

    await admin.patch('/api/admin/settings').send({ serviceIntervals: null }).expect(200);
    await service.refresh(t.organisationId);
    const back = await manager.get('/api/insights/reliability').query({ part: 'needle' });
    expect(back.body.planned).toMatchObject({ cycles: 500_000_000, sourceKind: 'common-practice' });
    expect((await manager.get(`/api/applicators/${c.id}`)).body.applicator.forecasts.find((f: { part: string }) => f.part === 'seat').thresholdSource).toBe('common-practice');
    expect(await seatRow()).toBeUndefined();
  });
});

describe('Weibull fit through the endpoint', () => {
  // Needle lives in millions of cycles: seven failures, two planned changes and three still running.
  const FAILURES = [12, 25, 31, 44, 52, 60, 75].map((m) => m * 1e6);
  const PLANNED = [40e6, 65e6];
  const RUNNING = [80e6, 90e6, 30e6];

  async function history(family: string) {
    for (const [ages, cause] of [
      [FAILURES, 'needle-chipped'],
      [PLANNED, null],
    ] as const) {
      for (const age of ages) {
        const x = await applicator({ fluid_family: family, status: 'retired' });
        await reading(x.id, '2025-01-01', 0);
        const r = await reading(x.id, '2025-06-01', age);
        await serviceEvent(x.id, { performed_on: '2025-06-01', actions: ['needle-replaced'], cause_code: cause, reading_id: r });
      }
    }
    for (const age of RUNNING) {
      const x = await applicator({ fluid_family: family });
      await reading(x.id, '2025-01-01', 0);
      await reading(x.id, '2025-06-01', age);
    }
  }

  /** Log-likelihood with right-censoring from @stdlib's Weibull CDF: ln f(t) for failures (f as the CDF's central difference), ln(1 − F(s)) for suspensions. */
  function logLikelihood(shape: number, scale: number, failures: number[], suspensions: number[]): number {
    let ll = 0;
    for (const x of failures) {
      const h = x * 1e-6;
      ll += Math.log((weibullCdf(x + h, shape, scale) - weibullCdf(x - h, shape, scale)) / (2 * h));
    }
    for (const s of suspensions) ll += Math.log(1 - weibullCdf(s, shape, scale));
    return ll;
  }

  it('when needle lives with planned changes and running units are recorded, then the returned shape and scale maximise the likelihood built with @stdlib (gradient about zero, every step away lower)', async () => {
    await history('xcheck');
    const res = await manager.get('/api/insights/reliability').query({ part: 'needle', fluidFamily: 'xcheck' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ failures: 7, suspensions: 5, cannotFit: null });
    expect(
      res.body.intervals
        .filter((i: { reason: string }) => i.reason === 'planned')
        .map((i: { cycles: number }) => i.cycles)
        .sort(),
    ).toEqual(PLANNED);
    const { shape, scale, b10 } = res.body.fit;
    const suspensions = [...PLANNED, ...RUNNING];
    const best = logLikelihood(shape, scale, FAILURES, suspensions);
    expect(Number.isFinite(best)).toBe(true);
    // Gradient in log-parameters by central differences (@stdlib's CDF): about zero at the maximum.
    const d = 1e-4;
    const dShape = (logLikelihood(shape * (1 + d), scale, FAILURES, suspensions) - logLikelihood(shape * (1 - d), scale, FAILURES, suspensions)) / (2 * d);
    const dScale = (logLikelihood(shape, scale * (1 + d), FAILURES, suspensions) - logLikelihood(shape, scale * (1 - d), FAILURES, suspensions)) / (2 * d);
    expect(Math.abs(dShape)).toBeLessThan(1e-3);
    expect(Math.abs(dScale)).toBeLessThan(1e-3);
    for (const [ds, dl] of [
      [1.02, 1],
      [0.98, 1],
      [1, 1.02],
      [1, 0.98],
      [1.02, 1.02],
      [0.98, 0.98],
      [1.02, 0.98],
      [0.98, 1.02],
    ]) {
      expect(logLikelihood(shape * ds, scale * dl, FAILURES, suspensions), `shape × ${ds}, scale × ${dl}`).toBeLessThan(best);
    }
    // B10 against @stdlib's Weibull quantile.
    expect(b10 / weibullQuantile(0.1, shape, scale)).toBeCloseTo(1, 9);
    // Leaving the suspensions out would give another (shorter-lived) fit: they are really used.
    expect(logLikelihood(shape, scale, FAILURES, [])).not.toBeCloseTo(best, 3);
  });

  it('when a failure interval spans a counter reset, then the cycles carry across it, and one failure alone is not fitted', async () => {
    const x = await applicator({ fluid_family: 'reset', status: 'retired' });
    await reading(x.id, '2025-01-01', 0);
    await reading(x.id, '2025-03-01', 30_000_000);
    await reading(x.id, '2025-04-01', 5_000_000, true);
    const r = await reading(x.id, '2025-06-01', 20_000_000);
    await serviceEvent(x.id, { performed_on: '2025-06-01', actions: ['needle-replaced'], cause_code: 'needle-chipped', reading_id: r });
    const res = await manager.get('/api/insights/reliability').query({ part: 'needle', fluidFamily: 'reset' });
    expect(res.body.intervals.map((i: { cycles: number; kind: string }) => [i.cycles, i.kind])).toEqual([[50_000_000, 'failure']]);
    expect(res.body.fit).toBeNull();
    expect(res.body.cannotFit).toMatch(/Only one failure/);
  });
});
