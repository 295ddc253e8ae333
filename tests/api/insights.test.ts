// /api/insights over a real database: Pareto counts and repeat failures from walks and service
// events, forecast dates and parts to order against hand-computed values, guide effectiveness,
// the Weibull fit cross-checked against a published example, the explanations given instead of
// numbers that cannot be computed, validation and permissions.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { localToday } from '../../src/shared/schemas/assets';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let manager: Agent;
let tech: Agent;
let userId: number;
let guideId: number;
let versionId: number;
let siteId: number;
let lineId: number;

const today = localToday();
const shift = (date: string, days: number) => new Date(Date.parse(`${date}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
let tagNo = 0;

async function applicator(extra: Record<string, unknown> = {}) {
  const [a] = await t
    .db('applicators')
    .insert({ organisation_id: t.organisationId, site_id: siteId, line_id: lineId, tag: `T-${++tagNo}`, actuation: 'electric', status: 'running', ...extra })
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

async function service(applicatorId: number, extra: Record<string, unknown>) {
  const [e] = await t
    .db('service_events')
    .insert({ organisation_id: t.organisationId, applicator_id: applicatorId, actions: ['cleaned'], ...extra })
    .returning('id');
  return e.id as number;
}

async function reading(applicatorId: number, readOn: string, count: number) {
  const [r] = await t.db('counter_readings').insert({ organisation_id: t.organisationId, applicator_id: applicatorId, read_on: readOn, count }).returning('id');
  return r.id as number;
}

beforeAll(async () => {
  t = await startTestApp();
  const signed = await t.signIn(['manager']);
  manager = signed.agent;
  userId = signed.user.id;
  tech = (await t.signIn(['technician'])).agent;
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
  const [s] = await t.db('sites').insert({ organisation_id: t.organisationId, name: 'Plant A' }).returning('id');
  siteId = s.id;
  const [l] = await t.db('lines').insert({ organisation_id: t.organisationId, site_id: siteId, name: 'Line 1' }).returning('id');
  lineId = l.id;
});

afterAll(async () => t?.close());

describe('recurring causes', () => {
  it('when walks and services name causes, then the Pareto counts them once each, sorted, with cumulative shares and repeats within the window', async () => {
    const a = await applicator({ fluid_family: 'pareto-test' });
    const b = await applicator({ fluid_family: 'pareto-test' });
    const at = (days: number) => `${shift(today, -days)}T10:00:00Z`;
    // Worn seat: two walks on A (40 days apart) and one service on B → 3.
    await walk({ applicator_id: a.id, status: 'ended', end_kind: 'finding', outcome: 'fixed', cause_code: 'seat-worn', started_at: at(100), ended_at: at(100) });
    const linked = await walk({ applicator_id: a.id, status: 'ended', end_kind: 'finding', outcome: 'fixed', cause_code: 'seat-worn', started_at: at(60), ended_at: at(60) });
    await service(b.id, { performed_on: shift(today, -50), cause_code: 'seat-worn', actions: ['seat-replaced'] });
    // The service recorded from the second walk is the same failure, not a fourth.
    await service(a.id, { performed_on: shift(today, -60), cause_code: 'seat-worn', actions: ['seat-replaced'], walk_id: linked });
    // Blocked nozzle: one service on B → 1. A walk that ended without a Finding does not count.
    await service(b.id, { performed_on: shift(today, -10), cause_code: 'nozzle-blocked' });
    await walk({ applicator_id: b.id, status: 'abandoned', end_kind: 'abandoned', cause_code: null, started_at: at(5) });

    const res = await manager.get('/api/insights/causes').query({ fluidFamily: 'pareto-test', repeatDays: 45, bucket: 'month' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.total).toBe(4);
    expect(res.body.fromWalks).toBe(2);
    expect(res.body.fromService).toBe(2);
    expect(res.body.pareto.map((p: { code: string; label: string; count: number; cumulativePercent: number }) => [p.code, p.label, p.count, p.cumulativePercent])).toEqual([
      ['seat-worn', 'Worn seat', 3, 75],
      ['nozzle-blocked', 'Blocked nozzle', 1, 100],
    ]);
    expect(res.body.repeats).toEqual([{ applicatorId: a.id, tag: a.tag, code: 'seat-worn', label: 'Worn seat', firstOn: shift(today, -100), repeatOn: shift(today, -60), daysApart: 40 }]);
    const trendTotal = res.body.trend.reduce((s: number, r: { counts: Record<string, number> }) => s + Object.values(r.counts).reduce((x, y) => x + y, 0), 0);
    expect(trendTotal).toBe(4);
    expect(res.body.empty).toBeNull();

    const narrow = await manager.get('/api/insights/causes').query({ fluidFamily: 'pareto-test', repeatDays: 39 });
    expect(narrow.body.repeats).toEqual([]);
    expect(narrow.body.repeatTotal).toBe(0);
  });

  it('when the period holds nothing, then the answer says why instead of giving empty or NaN shares', async () => {
    const res = await manager.get('/api/insights/causes').query({ from: '2001-01-01', to: '2001-12-31' });
    expect(res.status).toBe(200);
    expect(res.body.pareto).toEqual([]);
    expect(res.body.empty).toMatch(/nothing to rank/);
    expect(JSON.stringify(res.body)).not.toMatch(/NaN|null,"percent"/);
  });

  it('when the repeat window or the dates are not valid, then 400 names the field', async () => {
    const bad = await manager.get('/api/insights/causes').query({ repeatDays: 0 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.repeatDays).toMatch(/at least 1 day/);
    const order = await manager.get('/api/insights/causes').query({ from: '2026-05-01', to: '2026-04-01' });
    expect(order.status).toBe(400);
    expect(order.body.error.fields.to).toBeTruthy();
  });
});

describe('service forecast', () => {
  it('when two valves reach their seat interval in 50.5 and 20.5 days, then dates match by hand and the seat kits are summed by part number', async () => {
    // 100 cycles/min × 10 h × 7/7 days = 60,000 cycles a day; installed 1,000 days ago → 60 M now.
    // Seat renewed 900 days ago, at 6 M: 54 M since. Interval 57.03 M → 3.03 M / 60,000 = 50.5 days.
    const rate = { cycles_per_minute: 100, hours_per_day: 10, days_per_week: 7, installed_on: shift(today, -1000), fluid_family: 'forecast-test' };
    const a = await applicator({ ...rate, seat_interval_cycles: 57_030_000 });
    const b = await applicator({ ...rate, seat_interval_cycles: 55_230_000 });
    const kit = (qty: number) => [{ name: 'Seat kit, 0.8 mm', partNumber: 'LK-SK-08', quantity: qty }];
    await service(a.id, { performed_on: shift(today, -900), actions: ['seat-replaced'], parts: JSON.stringify([...kit(1), { name: 'O-ring 6 × 1.5', partNumber: 'LK-OR-615', quantity: 2 }]) });
    await service(b.id, { performed_on: shift(today, -900), actions: ['seat-replaced'], parts: JSON.stringify(kit(1)) });

    const res = await manager.get('/api/insights/forecast').query({ days: 90 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const mine = res.body.rows.filter((r: { applicatorId: number }) => r.applicatorId === a.id || r.applicatorId === b.id);
    expect(mine.map((r: { tag: string; part: string; dueOn: string; daysRemaining: number; cyclesSince: number }) => [r.tag, r.part, r.dueOn, r.daysRemaining, r.cyclesSince])).toEqual([
      [b.tag, 'seat', shift(today, 20), 20, 54_000_000],
      [a.tag, 'seat', shift(today, 50), 50, 54_000_000],
    ]);
    expect(res.body.partsToOrder).toContainEqual({ partNumber: 'LK-SK-08', name: 'Seat kit, 0.8 mm', quantity: 2, applicators: 2 });
    expect(res.body.partsToOrder).toContainEqual({ partNumber: 'LK-OR-615', name: 'O-ring 6 × 1.5', quantity: 2, applicators: 1 });

    const month = await manager.get('/api/insights/forecast').query({ days: 30 });
    expect(month.body.rows.filter((r: { applicatorId: number }) => r.applicatorId === a.id)).toEqual([]);
    expect(month.body.rows.some((r: { applicatorId: number }) => r.applicatorId === b.id)).toBe(true);

    const csv = await manager.get('/api/insights/forecast.csv').query({ days: 90 });
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text).toContain(`${b.tag},Plant A,Line 1,seat,${shift(today, 20)},20,ok,54000000,55230000,"1 x Seat kit, 0.8 mm (LK-SK-08)"`);
    expect(csv.text).toMatch(/LK-SK-08,"Seat kit, 0.8 mm",2,2/);
  });

  it('when the horizon is not 30, 60 or 90 days, then 400 names days', async () => {
    const res = await manager.get('/api/insights/forecast').query({ days: 45 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.days).toMatch(/30, 60 or 90/);
  });
});

describe('guide effectiveness', () => {
  it('when a version has a fixed and a not-fixed Finding, an abandoned and an open walk, then counts, the abandoning step and the median time to a Finding are given', async () => {
    const step = SAMPLE_GUIDE.steps[1] as { id: string; title: string };
    const at = (min: number) => new Date(Date.now() - 3 * 86_400_000 + min * 60_000).toISOString();
    await walk({ status: 'ended', end_kind: 'finding', outcome: 'fixed', cause_code: 'x', started_at: at(0), ended_at: at(10) });
    await walk({ status: 'ended', end_kind: 'finding', outcome: 'not-fixed', cause_code: 'x', started_at: at(0), ended_at: at(20) });
    await walk({ status: 'abandoned', end_kind: 'abandoned', ended_at_step_id: step.id, started_at: at(0), ended_at: at(5) });
    await walk({ status: 'open', current_step_id: step.id, started_at: at(0) });
    await t.db('step_flags').insert({ organisation_id: t.organisationId, guide_id: guideId, guide_version_id: versionId, step_id: step.id, comment: 'Unclear photo', user_id: userId });

    const res = await manager.get('/api/insights/guides').query({ from: shift(today, -4), to: today });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const v = res.body.versions.find((x: { versionId: number }) => x.versionId === versionId);
    expect(v).toMatchObject({ title: SAMPLE_GUIDE_META.title, versionNumber: 1, started: 4, finished: 2, fixed: 1, notFixed: 1, fixedByOther: 0, abandoned: 1, open: 1, openFlags: 1 });
    expect(v.medianMinutesToFinding).toBeCloseTo(15, 6);
    expect(v.abandonedAt).toEqual([{ stepId: step.id, title: step.title, count: 1 }]);
  });
});

describe('reliability', () => {
  async function history(family: string, failures: number[], running: number[]) {
    for (const age of failures) {
      const a = await applicator({ fluid_family: family, status: 'retired' });
      await reading(a.id, '2025-01-01', 0);
      const r = await reading(a.id, '2025-06-01', age);
      await service(a.id, { performed_on: '2025-06-01', actions: ['needle-replaced'], cause_code: 'needle-chipped', reading_id: r });
    }
    for (const age of running) {
      const a = await applicator({ fluid_family: family });
      await reading(a.id, '2025-01-01', 0);
      await reading(a.id, '2025-06-01', age);
    }
  }

  it('when the NIST/SEMATECH e-Handbook §8.4.1.3 data (10 failures, 10 running at 500) are recorded as needle lives, then MLE gives β 1.7208 and η 606.53, with the MRR probability plot', async () => {
    await history('nist', [54, 187, 216, 240, 244, 335, 361, 373, 375, 386], Array(10).fill(500));
    const res = await manager.get('/api/insights/reliability').query({ part: 'needle', fluidFamily: 'nist' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.failures).toBe(10);
    expect(res.body.suspensions).toBe(10);
    expect(res.body.fit.method).toBe('maximum likelihood');
    expect(res.body.fit.shape).toBeCloseTo(1.7208, 3);
    expect(res.body.fit.scale).toBeCloseTo(606.528, 1);
    expect(res.body.fit.b10).toBeCloseTo(606.528 * (-Math.log(0.9)) ** (1 / 1.7208), 0);
    expect(res.body.plot.method).toBe('median-rank regression');
    expect(res.body.plot.points).toHaveLength(10);
    expect(res.body.planned.cycles).toBe(5e8);
    expect(res.body.cannotFit).toBeNull();
  });

  it('when there is one failure, only running units or no history, then the answer says why nothing is fitted', async () => {
    await history('one', [1000], [2000, 3000]);
    await history('running', [], [2000, 3000]);
    const one = await manager.get('/api/insights/reliability').query({ part: 'needle', fluidFamily: 'one' });
    expect(one.body.fit).toBeNull();
    expect(one.body.cannotFit).toMatch(/Only one failure/);
    const running = await manager.get('/api/insights/reliability').query({ part: 'needle', fluidFamily: 'running' });
    expect(running.body.cannotFit).toMatch(/All 2 intervals ended without a failure/);
    const none = await manager.get('/api/insights/reliability').query({ part: 'coil', fluidFamily: 'nothing-here' });
    expect(none.body.cannotFit).toMatch(/No replacement/);
    expect(JSON.stringify([one.body, running.body, none.body])).not.toContain('NaN');
  });

  it('when the part is unknown, then 400 names part', async () => {
    const res = await manager.get('/api/insights/reliability').query({ part: 'spring' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.part).toMatch(/seat, needle, seals, coil/);
  });
});

describe('permissions', () => {
  it('when a technician asks for any insight, then 403', async () => {
    for (const path of ['/api/insights/causes', '/api/insights/forecast', '/api/insights/forecast.csv', '/api/insights/guides', '/api/insights/reliability']) {
      expect((await tech.get(path)).status, path).toBe(403);
    }
  });
});
