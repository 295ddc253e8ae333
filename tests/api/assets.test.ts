// Sites, lines and applicators over HTTP: who may manage, record and read; unique tags per site;
// spec rules and the organisation's own fields; the counter never going backwards; service events
// with causes, parts, photos and the walk behind them; walks started from an applicator; the
// applicator page with its forecasts; organisation scoping.
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { hashPassword } from '../../server/lib/passwords';
import { startTestApp, TEST_PASSWORD, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let admin: Agent;
let author: Agent;
let tech: Agent;
let manager: Agent;
let support: Agent;
let guideId: number;
let siteId: number;
let lineId: number;

const today = new Date().toISOString().slice(0, 10);
const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
let n = 0;
const uniqueTag = (base = 'V') => `${base}-${++n}${randomBytes(2).toString('hex')}`;

async function publishGuide() {
  return t.db.transaction(async (trx) => {
    const [guide] = await trx('guides').insert({ organisation_id: t.organisationId, status: 'active' }).returning('id');
    const [version] = await trx('guide_versions')
      .insert({
        guide_id: guide.id,
        number: 1,
        state: 'published',
        title: SAMPLE_GUIDE_META.title,
        symptom: SAMPLE_GUIDE_META.symptom,
        tags: SAMPLE_GUIDE_META.tags,
        content: JSON.stringify(SAMPLE_GUIDE),
        published_at: trx.fn.now(),
      })
      .returning('id');
    await trx('guides').where({ id: guide.id }).update({ published_version_id: version.id });
    return guide.id as number;
  });
}

const electric = (extra: Record<string, unknown> = {}) => ({
  lineId,
  tag: uniqueTag(),
  actuation: 'electric',
  coilDrive: '24v-dc',
  needleTip: 'ball',
  needleMaterial: 'Tungsten carbide',
  seatMaterial: 'Stainless steel',
  orificeDiameterMm: 0.8,
  fluidFamily: 'hot-melt',
  fluidName: 'Demo melt 140',
  viscosityMPas: 1500,
  viscosityTemperatureC: 160,
  densityGPerCm3: 0.98,
  heated: true,
  setTemperatureC: 165,
  installedOn: daysAgo(400),
  ...extra,
});

async function createApplicator(body: Record<string, unknown> = electric()) {
  const res = await admin.post('/api/applicators').send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.applicator;
}

beforeAll(async () => {
  t = await startTestApp();
  admin = (await t.signIn(['admin'])).agent;
  author = (await t.signIn(['author'])).agent;
  tech = (await t.signIn(['technician'])).agent;
  manager = (await t.signIn(['manager'])).agent;
  support = (await t.signIn(['support'])).agent;
  guideId = await publishGuide();
  siteId = (await admin.post('/api/sites').send({ name: 'North works', address: 'Unit 4, Mill Lane', contact: 'Shift lead' }).expect(201)).body.site.id;
  lineId = (await admin.post('/api/lines').send({ siteId, name: 'Line 1', area: 'Case sealing' }).expect(201)).body.line.id;
});
afterAll(async () => t?.close());

describe('who may do what', () => {
  it('when a technician or manager tries to add a site, line or applicator, then it is refused; authors may', async () => {
    expect((await tech.post('/api/sites').send({ name: 'Tech site' })).status).toBe(403);
    expect((await manager.post('/api/lines').send({ siteId, name: 'Manager line' })).status).toBe(403);
    expect((await tech.post('/api/applicators').send(electric())).status).toBe(403);
    expect((await author.post('/api/lines').send({ siteId, name: 'Author line' })).status).toBe(201);
  });

  it('when a technician records a reading, then it is kept; support and managers can read but not record', async () => {
    const a = await createApplicator();
    expect((await tech.post(`/api/applicators/${a.id}/readings`).send({ readOn: today, count: 1000 })).status).toBe(201);
    expect((await support.post(`/api/applicators/${a.id}/readings`).send({ readOn: today, count: 2000 })).status).toBe(403);
    expect((await manager.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: ['cleaned'] })).status).toBe(403);
    const seen = await manager.get(`/api/applicators/${a.id}`);
    expect(seen.status).toBe(200);
    expect(seen.body.applicator.readings.map((x: { count: number }) => x.count)).toEqual([1000]);
  });
});

describe('sites, lines and tags', () => {
  it('when a tag is used twice on one site, then the second is refused naming the tag; on another site it is fine', async () => {
    const a = await createApplicator();
    const again = await admin.post('/api/applicators').send(electric({ tag: a.tag.toLowerCase() }));
    expect(again.status).toBe(409);
    expect(again.body.error.fields.tag).toMatch(/Already used on North works/);
    const otherSite = (
      await admin
        .post('/api/sites')
        .send({ name: `South works ${++n}` })
        .expect(201)
    ).body.site.id;
    const otherLine = (await admin.post('/api/lines').send({ siteId: otherSite, name: 'Line 1' }).expect(201)).body.line.id;
    expect((await admin.post('/api/applicators').send(electric({ tag: a.tag, lineId: otherLine }))).status).toBe(201);
  });

  it('when a site name or line name is taken, then it is refused; a site with lines cannot be removed', async () => {
    expect((await admin.post('/api/sites').send({ name: 'north WORKS' })).status).toBe(409);
    expect((await admin.post('/api/lines').send({ siteId, name: 'line 1' })).body.error.fields.name).toBeTruthy();
    const del = await admin.delete(`/api/sites/${siteId}`);
    expect(del.status).toBe(409);
    expect(del.body.error.message).toMatch(/still has/);
  });

  it('when a line is given for a site of another organisation, then it is refused naming siteId', async () => {
    const [org] = await t.db('organisations').insert({ name: 'Elsewhere' }).returning('id');
    const [s] = await t.db('sites').insert({ organisation_id: org.id, name: 'Their site' }).returning('id');
    const res = await admin.post('/api/lines').send({ siteId: s.id, name: 'Sneaky' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.siteId).toMatch(/No such site/);
  });
});

describe('applicator specs', () => {
  it('when the specs contradict each other, then each problem is named by its field', async () => {
    const air = await admin.post('/api/applicators').send(electric({ actuation: 'air-operated', coilDrive: 'ac' }));
    expect(air.status).toBe(400);
    expect(air.body.error.fields.coilDrive).toMatch(/no coil drive/);
    const hot = await admin.post('/api/applicators').send(electric({ setTemperatureC: null }));
    expect(hot.body.error.fields.setTemperatureC).toMatch(/set temperature/);
    const visc = await admin.post('/api/applicators').send(electric({ viscosityTemperatureC: null }));
    expect(visc.body.error.fields.viscosityTemperatureC).toMatch(/temperature the viscosity/);
    const future = await admin.post('/api/applicators').send(electric({ installedOn: inDays(3) }));
    expect(future.body.error.fields.installedOn).toMatch(/in the future/);
    const rate = await admin.post('/api/applicators').send(electric({ cyclesPerMinute: 60 }));
    expect(rate.body.error.fields.hoursPerDay).toMatch(/together/);
    const fluid = await admin.post('/api/applicators').send(electric({ fluidFamily: 'lemonade' }));
    expect(fluid.status).toBe(400);
    expect(fluid.body.error.fields.fluidFamily).toMatch(/Unknown fluid family/);
    const orifice = await admin.post('/api/applicators').send(electric({ orificeDiameterMm: -1 }));
    expect(orifice.body.error.fields.orificeDiameterMm).toMatch(/mm/);
  });

  it('when the organisation adds its own field, then applicators take typed values for it without a code change', async () => {
    const field = (
      await admin
        .post('/api/applicators/fields')
        .send({ name: `Coil resistance ${++n}`, type: 'number', unit: 'ohm' })
        .expect(201)
    ).body.field;
    const bad = await admin.post('/api/applicators').send(electric({ custom: { [field.id]: 'high' } }));
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[`custom.${field.id}`]).toMatch(/must be a number in ohm/);
    const a = await createApplicator(electric({ custom: { [field.id]: 24.5 } }));
    expect(a.custom[field.id]).toBe(24.5);
    expect(a.fields.map((f: { id: number }) => f.id)).toContain(field.id);
    const unit = await admin.post('/api/applicators/fields').send({ name: 'Notes field', type: 'text', unit: 'mm' });
    expect(unit.body.error.fields.unit).toMatch(/Only number fields/);
    const retype = await admin.put(`/api/applicators/fields/${field.id}`).send({ name: field.name, type: 'text' });
    expect(retype.status).toBe(409);
    const clash = await admin.post('/api/applicators/fields').send({ name: 'Seat  material', type: 'text' });
    expect(clash.body.error.fields.name).toMatch(/'Seat material' is already a standard applicator field/);
    await admin.delete(`/api/applicators/fields/${field.id}`).expect(204);
    expect((await tech.get(`/api/applicators/${a.id}`)).body.applicator.custom).toEqual({});
  });

  it('when an applicator is edited, then the change is kept and the list finds it by tag', async () => {
    const a = await createApplicator();
    const res = await admin.put(`/api/applicators/${a.id}`).send(electric({ tag: a.tag, status: 'out-for-repair', heated: false, setTemperatureC: null }));
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.applicator).toMatchObject({ status: 'out-for-repair', heated: false });
    const list = await tech.get(`/api/applicators?q=${encodeURIComponent(a.tag)}`);
    expect(list.body.applicators.map((x: { id: number }) => x.id)).toEqual([a.id]);
    expect(list.body.total).toBe(1);
  });
});

describe('cycle counter', () => {
  it('when a reading goes backwards it is refused unless marked as a counter reset; a future date is refused', async () => {
    const a = await createApplicator();
    await tech
      .post(`/api/applicators/${a.id}/readings`)
      .send({ readOn: daysAgo(20), count: 5_000_000 })
      .expect(201);
    const back = await tech.post(`/api/applicators/${a.id}/readings`).send({ readOn: daysAgo(10), count: 4_000_000 });
    expect(back.status).toBe(400);
    expect(back.body.error.fields.count).toMatch(/cannot go backwards/);
    const future = await tech.post(`/api/applicators/${a.id}/readings`).send({ readOn: inDays(2), count: 6_000_000 });
    expect(future.status).toBe(400);
    expect(future.body.error.fields.readOn).toMatch(/in the future/);
    const reset = await tech.post(`/api/applicators/${a.id}/readings`).send({ readOn: daysAgo(10), count: 1_000, counterReset: true, note: 'Controller replaced' });
    expect(reset.status).toBe(201);
    const body = reset.body.applicator;
    expect(body.readings.map((x: { lifetime: number }) => x.lifetime)).toEqual([5_000_000, 5_001_000]);
    const typo = await tech.post(`/api/applicators/${a.id}/readings`).send({ readOn: today, count: 1.5 });
    expect(typo.body.error.fields.count).toMatch(/whole number/);
  });

  it('when readings exist, then the page carries the counter forward and forecasts seat and needle with common-practice intervals', async () => {
    const a = await createApplicator();
    await tech
      .post(`/api/applicators/${a.id}/readings`)
      .send({ readOn: daysAgo(10), count: 10_000_000 })
      .expect(201);
    const res = await tech.post(`/api/applicators/${a.id}/readings`).send({ readOn: today, count: 20_000_000 });
    const page = res.body.applicator;
    expect(page.counter).toMatchObject({ lastCount: 20_000_000, rateSource: 'readings', cyclesPerDay: 1_000_000, stale: false });
    expect(page.forecasts.map((f: { part: string }) => f.part)).toEqual(['seat', 'needle']);
    expect(page.forecasts[0]).toMatchObject({ cyclesSince: 20_000_000, threshold: 100_000_000, thresholdSource: 'common-practice', status: 'ok' });
    expect(page.forecasts[0].daysRemaining).toBeCloseTo(80, 6);
  });
});

describe('service events', () => {
  it('when a service is recorded with a cause, parts and the counter, then it shows in the history and restarts the seat forecast', async () => {
    const a = await createApplicator(electric({ seatIntervalCycles: 50_000_000 }));
    await tech
      .post(`/api/applicators/${a.id}/readings`)
      .send({ readOn: daysAgo(30), count: 30_000_000 })
      .expect(201);
    const res = await tech.post(`/api/applicators/${a.id}/service-events`).send({
      performedOn: daysAgo(5),
      actions: ['seat-replaced', 'cleaned'],
      causeCode: 'seat-worn',
      parts: [{ name: 'Seat kit', partNumber: 'LK-SK-08', quantity: 1 }],
      cycleCount: 48_000_000,
      notes: 'Frosted ring on the seat',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const page = res.body.applicator;
    expect(page.serviceEvents).toHaveLength(1);
    expect(page.serviceEvents[0]).toMatchObject({
      actions: ['seat-replaced', 'cleaned'],
      causeCode: 'seat-worn',
      causeLabel: 'Seat worn or damaged',
      cycleCount: 48_000_000,
      performedBy: 'Test technician',
    });
    expect(page.serviceEvents[0].parts).toEqual([{ name: 'Seat kit', partNumber: 'LK-SK-08', quantity: 1 }]);
    expect(page.readings.map((r: { count: number; source: string }) => [r.count, r.source])).toEqual([
      [30_000_000, 'manual'],
      [48_000_000, 'service'],
    ]);
    const seat = page.forecasts.find((f: { part: string }) => f.part === 'seat');
    expect(seat).toMatchObject({ since: daysAgo(5), thresholdSource: 'applicator', threshold: 50_000_000 });
    expect(seat.cyclesSince).toBeLessThan(48_000_000);
  });

  it('when the cause, photos or cycle count are wrong, then each is named and nothing is kept', async () => {
    const a = await createApplicator();
    await tech
      .post(`/api/applicators/${a.id}/readings`)
      .send({ readOn: daysAgo(3), count: 900 })
      .expect(201);
    const cause = await tech.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: ['cleaned'], causeCode: 'gremlins' });
    expect(cause.body.error.fields.causeCode).toMatch(/Unknown cause/);
    const photo = await tech.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: ['cleaned'], fileIds: ['5f1d7c2e-8a40-4c57-9a3c-2f4f1e0b7d11'] });
    expect(photo.body.error.fields.fileIds).toMatch(/not found/);
    const back = await tech.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: ['coil-replaced'], cycleCount: 10 });
    expect(back.body.error.fields.cycleCount).toMatch(/cannot go backwards/);
    const other = await tech.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: ['other'] });
    expect(other.body.error.fields.otherAction).toMatch(/Say what else/);
    const none = await tech.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: [] });
    expect(none.body.error.fields.actions).toMatch(/Say what was done/);
    const page = (await tech.get(`/api/applicators/${a.id}`)).body.applicator;
    expect(page.serviceEvents).toEqual([]);
    expect(page.readings).toHaveLength(1);
  });
});

describe('walks on an applicator', () => {
  it('when a walk starts from an applicator, then its tag, line and site are recorded with the link, and one service event can follow it', async () => {
    const a = await createApplicator();
    const start = await tech.post('/api/walks').send({ guideId, applicatorId: a.id, applicator: 'typed over' });
    expect(start.status, JSON.stringify(start.body)).toBe(201);
    expect(start.body.walk).toMatchObject({ applicatorId: a.id, applicator: a.tag, line: 'Line 1', site: 'North works' });
    const walkId = start.body.walk.id;
    const page = (await tech.get(`/api/applicators/${a.id}`)).body.applicator;
    expect(page.walks.map((w: { id: number }) => w.id)).toEqual([walkId]);
    expect(page.walks[0]).toMatchObject({ symptom: SAMPLE_GUIDE_META.symptom, status: 'open' });

    const b = await createApplicator();
    const wrong = await tech.post(`/api/applicators/${b.id}/service-events`).send({ performedOn: today, actions: ['cleaned'], walkId });
    expect(wrong.body.error.fields.walkId).toMatch(/another applicator/);
    await tech
      .post(`/api/applicators/${a.id}/service-events`)
      .send({ performedOn: today, actions: ['cleaned'], walkId })
      .expect(201);
    const twice = await tech.post(`/api/applicators/${a.id}/service-events`).send({ performedOn: today, actions: ['cleaned'], walkId });
    expect(twice.status).toBe(409);
  });

  it('when a walk names an applicator of another organisation, then it is refused naming applicatorId', async () => {
    const [org] = await t
      .db('organisations')
      .insert({ name: `Other ${randomBytes(3).toString('hex')}` })
      .returning('id');
    const [s] = await t.db('sites').insert({ organisation_id: org.id, name: 'Theirs' }).returning('id');
    const [l] = await t.db('lines').insert({ organisation_id: org.id, site_id: s.id, name: 'L' }).returning('id');
    const [x] = await t.db('applicators').insert({ organisation_id: org.id, site_id: s.id, line_id: l.id, tag: 'X-1', actuation: 'electric' }).returning('id');
    const res = await tech.post('/api/walks').send({ guideId, applicatorId: x.id });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.applicatorId).toMatch(/No such applicator/);

    const email = `other-${randomBytes(4).toString('hex')}@example.com`;
    await t.db('users').insert({ organisation_id: org.id, email, name: 'Other', roles: ['admin'], password_hash: await hashPassword(TEST_PASSWORD) });
    const outsider = t.agent();
    await outsider.post('/api/auth/login').send({ email, password: TEST_PASSWORD }).expect(200);
    const mine = await createApplicator();
    expect((await outsider.get(`/api/applicators/${mine.id}`)).status).toBe(404);
    expect((await outsider.post(`/api/applicators/${mine.id}/readings`).send({ readOn: today, count: 1 })).status).toBe(404);
    expect((await outsider.get('/api/applicators')).body.applicators.map((y: { tag: string }) => y.tag)).toEqual(['X-1']);
  });
});
