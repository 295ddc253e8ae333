// Organisation settings: the default unit system and default service intervals are stored per
// organisation, validated field by field, audited, and reset to common practice on request.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { COMMON_PRACTICE_INTERVALS } from '../../src/shared/schemas/settings';
import { startTestApp, type TestApp } from '../helpers/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let t: TestApp;
let admin: Agent;
let tech: Agent;

beforeAll(async () => {
  t = await startTestApp();
  admin = (await t.signIn(['admin'])).agent;
  tech = (await t.signIn(['technician'])).agent;
});
afterAll(async () => t?.close());

describe('organisation settings', () => {
  it('when nothing was set, then the settings answer metric and the common-practice intervals (seat 100 M, needle 500 M, seals 50 M)', async () => {
    const s = (await admin.get('/api/admin/settings').expect(200)).body.settings;
    expect(s).toMatchObject({ defaultUnitSystem: 'metric', serviceIntervalsAreDefault: true, serviceIntervals: { seatCycles: 100_000_000, needleCycles: 500_000_000, sealsCycles: 50_000_000 } });
  });

  it('when an admin sets imperial and own intervals, then they are stored, audited, and null restores common practice', async () => {
    const own = { seatCycles: 80_000_000, needleCycles: 400_000_000, sealsCycles: 30_000_000 };
    const s = (await admin.patch('/api/admin/settings').send({ defaultUnitSystem: 'imperial', serviceIntervals: own }).expect(200)).body.settings;
    expect(s).toMatchObject({ defaultUnitSystem: 'imperial', serviceIntervals: own, serviceIntervalsAreDefault: false, allowSelfPublish: false });
    const row = await t.db('audit_events').where({ action: 'settings.update' }).orderBy('id', 'desc').first();
    expect(row.after).toMatchObject({ defaultUnitSystem: 'imperial', serviceIntervals: own });
    const back = (await admin.patch('/api/admin/settings').send({ serviceIntervals: null }).expect(200)).body.settings;
    expect(back).toMatchObject({ defaultUnitSystem: 'imperial', serviceIntervals: COMMON_PRACTICE_INTERVALS, serviceIntervalsAreDefault: true });
  });

  it('when an interval is negative, fractional or missing, or the unit system unknown, then 400 names the field and nothing changes', async () => {
    const before = (await admin.get('/api/admin/settings').expect(200)).body.settings;
    const bad = [
      [{ serviceIntervals: { seatCycles: -5, needleCycles: 5e8, sealsCycles: 5e7 } }, 'serviceIntervals.seatCycles'],
      [{ serviceIntervals: { seatCycles: 1e8, needleCycles: 1.5e3 + 0.5, sealsCycles: 5e7 } }, 'serviceIntervals.needleCycles'],
      [{ serviceIntervals: { seatCycles: 1e8, needleCycles: 5e8 } }, 'serviceIntervals.sealsCycles'],
      [{ defaultUnitSystem: 'cubits' }, 'defaultUnitSystem'],
    ] as const;
    for (const [body, field] of bad) {
      const res = await admin.patch('/api/admin/settings').send(body);
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.error.fields)).toContain(field);
    }
    expect((await admin.get('/api/admin/settings').expect(200)).body.settings).toEqual(before);
  });

  it('when a technician tries to change the settings, then it is refused', async () => {
    await tech.patch('/api/admin/settings').send({ defaultUnitSystem: 'imperial' }).expect(403);
  });
});
