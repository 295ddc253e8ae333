// CSV import and export of sites, lines, own fields, applicators and counter readings: the round
// trip into an empty organisation, row-level problems in the preview, all-or-nothing commits and
// "valid rows only", and the files spreadsheets really produce (byte-order mark, semicolons and
// decimal commas, a wrong header, a file past the row limit).
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../server/lib/passwords';
import { startTestApp, TEST_PASSWORD, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let admin: Agent;

const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);

/** A fresh organisation with one admin: each import test starts from nothing. */
async function emptyOrganisation(): Promise<{ agent: Agent; organisationId: number }> {
  const [org] = await t
    .db('organisations')
    .insert({ name: `Import works ${randomBytes(3).toString('hex')}` })
    .returning('id');
  const email = `admin-${randomBytes(4).toString('hex')}@example.com`;
  await t.db('users').insert({ organisation_id: org.id, email, name: 'Import admin', roles: ['admin'], password_hash: await hashPassword(TEST_PASSWORD) });
  const agent = t.agent();
  await agent.post('/api/auth/login').send({ email, password: TEST_PASSWORD }).expect(200);
  return { agent, organisationId: org.id };
}

const csvPost = (agent: Agent, path: string, text: string) => agent.post(path).set('Content-Type', 'text/csv').send(text);
const count = async (table: string, organisationId: number) => Number((await t.db(table).where({ organisation_id: organisationId }).count('* as n'))[0].n);

async function exportCsv(agent: Agent, path: string): Promise<string> {
  const res = await agent
    .get(path)
    .buffer(true)
    .parse((r, cb) => {
      let data = '';
      r.setEncoding('utf8');
      r.on('data', (c: string) => (data += c));
      r.on('end', () => cb(null, data));
    });
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toMatch(/text\/csv/);
  return res.body as string;
}

const EXPORTS = [
  ['sites', '/api/sites/export.csv'],
  ['lines', '/api/lines/export.csv'],
  ['fields', '/api/applicators/fields/export.csv'],
  ['applicators', '/api/applicators/export.csv'],
  ['readings', '/api/applicators/readings/export.csv'],
] as const;

beforeAll(async () => {
  t = await startTestApp();
  admin = (await t.signIn(['admin'])).agent;
});
afterAll(async () => t?.close());

describe('round trip', () => {
  it('when every list is exported and imported into an empty organisation, then the second organisation exports the same files', async () => {
    const site = (await admin.post('/api/sites').send({ name: 'Hollin Road', address: 'Hollin Road, Bay 2', contact: 'Ext. 214' }).expect(201)).body.site;
    const site2 = (await admin.post('/api/sites').send({ name: 'Quay "East", annex' }).expect(201)).body.site;
    const line = (await admin.post('/api/lines').send({ siteId: site.id, name: 'Line 3', area: 'Tray forming' }).expect(201)).body.line;
    const line2 = (await admin.post('/api/lines').send({ siteId: site2.id, name: '=Line; 9' }).expect(201)).body.line;
    const ohm = (await admin.post('/api/applicators/fields').send({ name: 'Coil resistance', type: 'number', unit: 'ohm' }).expect(201)).body.field;
    const checked = (await admin.post('/api/applicators/fields').send({ name: 'Checked on', type: 'date' }).expect(201)).body.field;
    const guard = (await admin.post('/api/applicators/fields').send({ name: 'Guard fitted', type: 'yes-no' }).expect(201)).body.field;
    const a1 = (
      await admin
        .post('/api/applicators')
        .send({
          lineId: line.id,
          tag: 'HR-301',
          actuation: 'electric',
          coilDrive: 'high-voltage',
          needleTip: 'cone',
          needleMaterial: 'Tungsten carbide',
          seatMaterial: 'Stainless, hardened',
          orificeDiameterMm: 0.6,
          nozzle: 'Flat 0.3 mm',
          fluidFamily: 'hot-melt',
          fluidName: 'Melt "HT" 150',
          viscosityMPas: 1250.5,
          viscosityTemperatureC: 150,
          densityGPerCm3: 0.97,
          heated: true,
          setTemperatureC: 160,
          installedOn: daysAgo(300),
          status: 'running',
          cyclesPerMinute: 120,
          hoursPerDay: 16,
          daysPerWeek: 5,
          seatIntervalCycles: 80_000_000,
          custom: { [ohm.id]: 24.5, [checked.id]: daysAgo(10), [guard.id]: true },
        })
        .expect(201)
    ).body.applicator;
    const a2 = (
      await admin
        .post('/api/applicators')
        .send({ lineId: line2.id, tag: '-QE-7', actuation: 'air-operated', airPressureBar: 5.5, status: 'spare', fluidFamily: 'cold-glue', custom: { [guard.id]: false } })
        .expect(201)
    ).body.applicator;
    await admin
      .post(`/api/applicators/${a1.id}/readings`)
      .send({ readOn: daysAgo(20), count: 4_000_000 })
      .expect(201);
    await admin
      .post(`/api/applicators/${a1.id}/readings`)
      .send({ readOn: daysAgo(20), count: 4_100_000, note: 'Second read, same day' })
      .expect(201);
    await admin
      .post(`/api/applicators/${a1.id}/readings`)
      .send({ readOn: daysAgo(5), count: 2_000, counterReset: true, note: 'Controller swapped, counter at 2,000' })
      .expect(201);
    await admin
      .post(`/api/applicators/${a2.id}/readings`)
      .send({ readOn: daysAgo(1), count: 77 })
      .expect(201);

    const before: Record<string, string> = {};
    for (const [kind, path] of EXPORTS) before[kind] = await exportCsv(admin, path);
    expect(before.sites.startsWith('\uFEFFSite,Address or area,Contact\r\n')).toBe(true);
    // Text a spreadsheet would run as a formula leaves with an apostrophe.
    expect(before.lines).toContain("'=Line; 9");

    const fresh = await emptyOrganisation();
    for (const [kind] of EXPORTS) {
      const res = await csvPost(fresh.agent, `/api/applicators/import/${kind}`, before[kind]);
      expect(res.status, `${kind}: ${JSON.stringify(res.body)}`).toBe(201);
    }
    for (const [kind, path] of EXPORTS) expect(await exportCsv(fresh.agent, path), kind).toBe(before[kind]);
    expect(await count('counter_readings', fresh.organisationId)).toBe(4);
  });
});

describe('preview and commit', () => {
  async function setup() {
    const org = await emptyOrganisation();
    await csvPost(org.agent, '/api/applicators/import/sites', 'Site\nMarsh Lane\n').expect(201);
    await csvPost(org.agent, '/api/applicators/import/lines', 'Site,Line\nMarsh Lane,Line A\nMarsh Lane,Line B\n').expect(201);
    await csvPost(org.agent, '/api/applicators/import/applicators', 'Site,Line,Tag,Actuation\nMarsh Lane,Line A,ML-1,electric\n').expect(201);
    return org;
  }

  const file = [
    'Site,Line,Tag,Actuation,Orifice diameter (mm),Installed on',
    'Marsh Lane,Line A,ML-2,electric,0.8,2024-05-01', // row 2: fine
    'Marsh Lane,Line Z,ML-3,electric,,', // row 3: unknown line
    'Marsh Lane,Line B,ML-4,electric,zero point eight,', // row 4: bad number
    'Marsh Lane,Line B,ML-1,electric,,', // row 5: tag already exists
    'Marsh Lane,Line B,ML-2,air-operated,,', // row 6: tag twice in the file
    `Marsh Lane,Line B,ML-5,electric,,${inDays(5)}`, // row 7: future date
    'Marsh Lane,Line B,ML-6,hydraulic,,', // row 8: unknown actuation
  ].join('\n');

  it('when a file has bad rows, then the preview names each row and column and the database is untouched', async () => {
    const org = await setup();
    const res = await csvPost(org.agent, '/api/applicators/import/applicators/preview', file);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const p = res.body.preview;
    expect(p).toMatchObject({ totalRows: 7, validRows: 1, invalidRows: 6, delimiter: ',' });
    const where = p.problems.map((x: { row: number; column: string }) => `${x.row}:${x.column}`);
    expect(where).toEqual(['3:Line', '4:Orifice diameter (mm)', '5:Tag', '6:Tag', '7:Installed on', '8:Actuation']);
    const text = p.problems.map((x: { message: string }) => x.message).join('\n');
    expect(text).toMatch(/No line 'Line Z' on Marsh Lane/);
    expect(text).toMatch(/'zero point eight' is not a number in mm/);
    expect(text).toMatch(/Tag ML-1 already exists on Marsh Lane/);
    expect(text).toMatch(/appears twice in the file \(first on row 2\)/);
    expect(text).toMatch(/in the future/);
    expect(p.sample[0]).toEqual({ row: 2, ok: true, values: { Site: 'Marsh Lane', Line: 'Line A', Tag: 'ML-2', Actuation: 'electric', 'Orifice diameter (mm)': '0.8', 'Installed on': '2024-05-01' } });
    expect(await count('applicators', org.organisationId)).toBe(1);
  });

  it('when such a file is committed all-or-nothing, then nothing is imported and the 400 names rows and columns', async () => {
    const org = await setup();
    const res = await csvPost(org.agent, '/api/applicators/import/applicators', file);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Nothing was imported: 6 of 7 rows have problems \(first: row 3, Line/);
    expect(res.body.error.fields['rows.4.Orifice diameter (mm)']).toMatch(/^Row 4, Orifice diameter \(mm\): 'zero point eight' is not a number/);
    expect(res.body.error.details.problems).toHaveLength(6);
    expect(await count('applicators', org.organisationId)).toBe(1);
  });

  it('when the user chooses valid rows only, then those are imported and the skipped ones reported', async () => {
    const org = await setup();
    const res = await csvPost(org.agent, '/api/applicators/import/applicators?mode=valid-only', file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.result).toMatchObject({ imported: 1, skippedRows: 6 });
    expect(res.body.result.skipped.map((x: { row: number }) => x.row)).toEqual([3, 4, 5, 6, 7, 8]);
    expect(await t.db('applicators').where({ organisation_id: org.organisationId }).orderBy('tag').pluck('tag')).toEqual(['ML-1', 'ML-2']);
  });

  it('when counter readings in a file go backwards or lie in the future, then those rows are named; a reset row is accepted', async () => {
    const org = await setup();
    const readings = [
      'Site,Tag,Date,Count (cycles),Counter reset',
      `Marsh Lane,ML-1,${daysAgo(30)},1000,`,
      `Marsh Lane,ML-1,${daysAgo(20)},900,no`, // backwards
      `Marsh Lane,ML-1,${daysAgo(10)},50,yes`, // reset
      `Marsh Lane,ML-1,${inDays(3)},60,`, // future
      `Marsh Lane,ML-9,${daysAgo(3)},60,`, // unknown tag
      `Marsh Lane,ML-1,${daysAgo(2)},7.5,`, // not whole
    ].join('\r\n');
    const p = (await csvPost(org.agent, '/api/applicators/import/readings/preview', readings).expect(200)).body.preview;
    expect(p.problems.map((x: { row: number; column: string }) => `${x.row}:${x.column}`)).toEqual(['3:Count (cycles)', '5:Date', '6:Tag', '7:Count (cycles)']);
    expect(p.problems[0].message).toMatch(/cannot go backwards: 900 cycles is below the 1,000 cycles/);
    const done = (await csvPost(org.agent, '/api/applicators/import/readings?mode=valid-only', readings).expect(201)).body.result;
    expect(done.imported).toBe(2);
    const again = (await csvPost(org.agent, '/api/applicators/import/readings/preview', readings.split('\r\n').slice(0, 2).join('\n')).expect(200)).body.preview;
    expect(again.problems[0].message).toMatch(/already recorded/);
  });
});

describe('files from spreadsheets', () => {
  it('when a file has a byte-order mark, semicolons and decimal commas, then it is read correctly', async () => {
    const org = await emptyOrganisation();
    await csvPost(org.agent, '/api/applicators/import/sites', '\uFEFFsite;ADDRESS OR AREA\r\nKiln Yard;"Gate 2; north side"\r\n').expect(201);
    await csvPost(org.agent, '/api/applicators/import/lines', '\uFEFFSite;Line\r\nKiln Yard;L1\r\n').expect(201);
    const res = await csvPost(org.agent, '/api/applicators/import/applicators/preview', '\uFEFFSite;Line;Tag;Actuation;Air pressure (bar)\r\nKiln Yard;L1;KY-1;Air-operated;5,5\r\n');
    expect(res.body.preview).toMatchObject({ delimiter: ';', validRows: 1, invalidRows: 0 });
    await csvPost(org.agent, '/api/applicators/import/applicators', '\uFEFFSite;Line;Tag;Actuation;Air pressure (bar)\r\nKiln Yard;L1;KY-1;Air-operated;5,5\r\n').expect(201);
    const row = await t.db('applicators').where({ organisation_id: org.organisationId }).first();
    expect(row).toMatchObject({ tag: 'KY-1', actuation: 'air-operated', air_pressure_bar: 5.5 });
    expect((await t.db('sites').where({ organisation_id: org.organisationId }).first()).address).toBe('Gate 2; north side');
  });

  it('when the header is wrong or the columns are not separated, then the file is refused with what was expected', async () => {
    const org = await emptyOrganisation();
    const wrong = await csvPost(org.agent, '/api/applicators/import/lines/preview', 'Plant,Line,Colour\nX,Y,Z\n');
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.header).toMatch(/missing column 'Site'; unknown columns 'Plant', 'Colour'/);
    const squashed = await csvPost(org.agent, '/api/applicators/import/lines/preview', 'Site:Line\nX:Y\n');
    expect(squashed.body.error.fields.header).toMatch(/Only one column was found/);
    const empty = await csvPost(org.agent, '/api/applicators/import/sites', '\uFEFF\r\n');
    expect(empty.body.error.fields.file).toMatch(/empty/);
    const json = await org.agent.post('/api/applicators/import/sites').send({});
    expect(json.status).toBe(400);
    expect(json.body.error.fields.csv).toBeTruthy();
  });

  it('when a file has more than 100,000 rows, then it is refused as a whole with the limit in words', async () => {
    const org = await emptyOrganisation();
    const rows = Array.from({ length: 100_001 }, (_, i) => `S${i}`);
    const res = await csvPost(org.agent, '/api/applicators/import/sites/preview', ['Site', ...rows].join('\n'));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('This file has 100,001 rows; one import takes at most 100,000. Split it into smaller files and import them one after the other.');
    expect(await count('sites', org.organisationId)).toBe(0);
  });

  it('when a template is downloaded, then it holds the header row including the organisation’s own fields', async () => {
    const org = await emptyOrganisation();
    await org.agent.post('/api/applicators/fields').send({ name: 'Pump model', type: 'text' }).expect(201);
    const text = await exportCsv(org.agent, '/api/applicators/import/applicators/template');
    expect(text.split('\r\n')[0]).toMatch(/^\uFEFFSite,Line,Tag,Actuation,Coil drive,.*,Seals interval \(cycles\),Pump model$/);
    const tech = (await t.signIn(['technician'])).agent;
    expect((await csvPost(tech, '/api/applicators/import/sites', 'Site\nX\n')).status).toBe(403);
  });
});
