// Demo mode only: two invented plants of the demo organisation with lines, applicators, the
// organisation's own fields, months of counter readings and a few service events, dated relative
// to today so the forecasts look live. Idempotent: skipped when the organisation has sites.
import type { Knex } from 'knex';
import { DEMO_ORGANISATION } from './01-demo-organisation';
import { APPLICATOR_SPEC_COLUMNS } from '../server/modules/assets/assets.repository';

const DAY_MS = 86_400_000;
const daysAgo = (n: number) => new Date(Date.now() - n * DAY_MS).toISOString().slice(0, 10);

interface DemoApplicator {
  site: string;
  line: string;
  tag: string;
  spec: Record<string, unknown>;
  /** Cycles a day the counter actually ran at, and for how many days back readings go. */
  perDay?: number;
  history?: number;
  custom?: Record<string, unknown>;
}

const SITES = [
  { name: 'Mill Road plant', address: '14 Mill Road, Larkfield (demo address)', contact: 'Maintenance office, ext. 210' },
  { name: 'Wharf Street plant', address: 'Unit 7, Wharf Street, Larkfield (demo address)', contact: 'Shift lead, ext. 330' },
];

const LINES = [
  { site: 'Mill Road plant', name: 'Line 3 (carton sealing)', area: 'Hall B, end of line' },
  { site: 'Mill Road plant', name: 'Line 5 (tray forming)', area: 'Hall C' },
  { site: 'Wharf Street plant', name: 'Line 1 (case erecting)', area: 'Bay 1' },
  { site: 'Wharf Street plant', name: 'Line 2 (labelling)', area: 'Bay 2' },
];

const hotMelt = { fluidFamily: 'hot-melt', fluidName: 'Larkmelt 160 (demo)', viscosityMPas: 1400, viscosityTemperatureC: 160, densityGPerCm3: 0.97, heated: true, setTemperatureC: 165 };
const carbideBall = { needleTip: 'ball', needleMaterial: 'Tungsten carbide', seatMaterial: 'Stainless steel', orificeDiameterMm: 0.8 };

const APPLICATORS: DemoApplicator[] = [
  {
    site: 'Mill Road plant',
    line: 'Line 3 (carton sealing)',
    tag: 'V-312',
    spec: {
      actuation: 'electric',
      coilDrive: 'high-voltage',
      ...carbideBall,
      nozzle: 'Single orifice, 0.5 mm',
      ...hotMelt,
      installedOn: daysAgo(420),
      cyclesPerMinute: 90,
      hoursPerDay: 16,
      daysPerWeek: 5,
    },
    perDay: 62_000,
    history: 240,
    custom: { coil: 25, shelf: 'Store B, bin 14' },
  },
  {
    site: 'Mill Road plant',
    line: 'Line 3 (carton sealing)',
    tag: 'V-313',
    spec: {
      actuation: 'electric',
      coilDrive: 'high-voltage',
      ...carbideBall,
      nozzle: 'Single orifice, 0.5 mm',
      ...hotMelt,
      installedOn: daysAgo(420),
      cyclesPerMinute: 90,
      hoursPerDay: 16,
      daysPerWeek: 5,
    },
    perDay: 58_000,
    history: 240,
    custom: { coil: 25, shelf: 'Store B, bin 14' },
  },
  {
    site: 'Mill Road plant',
    line: 'Line 3 (carton sealing)',
    tag: 'V-314',
    spec: {
      actuation: 'electric',
      coilDrive: '24v-dc',
      needleTip: 'cone',
      needleMaterial: 'Silicon carbide',
      seatMaterial: 'Stainless steel',
      orificeDiameterMm: 0.6,
      nozzle: 'Dot nozzle, 0.4 mm',
      ...hotMelt,
      installedOn: daysAgo(300),
      cyclesPerMinute: 300,
      hoursPerDay: 20,
      daysPerWeek: 6,
    },
    perDay: 300_000,
    history: 250,
    custom: { coil: 12.2 },
  },
  {
    site: 'Mill Road plant',
    line: 'Line 5 (tray forming)',
    tag: 'A-501',
    spec: {
      actuation: 'air-operated',
      airPressureBar: 5.5,
      needleTip: 'cone',
      needleMaterial: 'Hardened stainless steel',
      seatMaterial: 'Stainless steel',
      orificeDiameterMm: 1.2,
      nozzle: 'Bead nozzle, 1.0 mm',
      fluidFamily: 'cold-glue',
      fluidName: 'Aqua-bond 30 (demo)',
      viscosityMPas: 3000,
      viscosityTemperatureC: 20,
      densityGPerCm3: 1.08,
      heated: false,
      installedOn: daysAgo(500),
      cyclesPerMinute: 40,
      hoursPerDay: 16,
      daysPerWeek: 5,
      sealsIntervalCycles: 20_000_000,
    },
    perDay: 28_000,
    history: 300,
    custom: { shelf: 'Store A, bin 3' },
  },
  {
    site: 'Mill Road plant',
    line: 'Line 5 (tray forming)',
    tag: 'A-502',
    spec: {
      actuation: 'air-operated',
      airPressureBar: 5.5,
      needleTip: 'cone',
      needleMaterial: 'Hardened stainless steel',
      seatMaterial: 'Stainless steel',
      orificeDiameterMm: 1.2,
      nozzle: 'Bead nozzle, 1.0 mm',
      fluidFamily: 'cold-glue',
      fluidName: 'Aqua-bond 30 (demo)',
      heated: false,
      installedOn: daysAgo(90),
      status: 'spare',
    },
  },
  {
    site: 'Wharf Street plant',
    line: 'Line 1 (case erecting)',
    tag: 'W-101',
    spec: { actuation: 'electric', coilDrive: 'ac', ...carbideBall, nozzle: 'Two-orifice, 0.5 mm', ...hotMelt, installedOn: daysAgo(200), cyclesPerMinute: 70, hoursPerDay: 8, daysPerWeek: 5 },
    perDay: 24_000,
    history: 190,
  },
  {
    site: 'Wharf Street plant',
    line: 'Line 2 (labelling)',
    tag: 'W-201',
    spec: {
      actuation: 'air-operated',
      airPressureBar: 4.5,
      needleTip: 'ball',
      needleMaterial: 'Tungsten carbide',
      seatMaterial: 'Stainless steel',
      orificeDiameterMm: 0.5,
      nozzle: 'Spray cap',
      fluidFamily: 'silicone',
      fluidName: 'Siltack 5 (demo)',
      viscosityMPas: 800,
      viscosityTemperatureC: 25,
      densityGPerCm3: 1.02,
      heated: false,
      installedOn: daysAgo(365),
      cyclesPerMinute: 30,
      hoursPerDay: 8,
      daysPerWeek: 5,
    },
    perDay: 12_000,
    history: 120,
  },
  {
    site: 'Wharf Street plant',
    line: 'Line 2 (labelling)',
    tag: 'W-202',
    spec: { actuation: 'electric', coilDrive: '24v-dc', ...carbideBall, fluidFamily: 'silicone', fluidName: 'Siltack 5 (demo)', heated: false, installedOn: daysAgo(700), status: 'out-for-repair' },
  },
];

export async function seed(knex: Knex): Promise<void> {
  if (process.env.BEADPATH_DEMO !== '1') return;
  const org = await knex('organisations').where({ name: DEMO_ORGANISATION }).first();
  if (!org) return;
  if (await knex('sites').where({ organisation_id: org.id }).first()) return;
  const tech = await knex('users').where({ email: 'tech@example.com' }).first();
  const author = await knex('users').where({ email: 'author@example.com' }).first();
  await knex.transaction(async (trx) => {
    const siteId = new Map<string, number>();
    for (const s of SITES)
      siteId.set(
        s.name,
        (
          await trx('sites')
            .insert({ organisation_id: org.id, ...s })
            .returning('id')
        )[0].id,
      );
    const lineId = new Map<string, number>();
    for (const l of LINES)
      lineId.set(
        l.name,
        (
          await trx('lines')
            .insert({ organisation_id: org.id, site_id: siteId.get(l.site), name: l.name, area: l.area })
            .returning('id')
        )[0].id,
      );
    const [coil] = await trx('applicator_fields').insert({ organisation_id: org.id, name: 'Coil resistance at 20 °C', type: 'number', unit: 'ohm', position: 0 }).returning('id');
    const [shelf] = await trx('applicator_fields').insert({ organisation_id: org.id, name: 'Spare kit location', type: 'text', position: 1 }).returning('id');

    const ids = new Map<string, number>();
    for (const a of APPLICATORS) {
      const cols: Record<string, unknown> = {};
      for (const [k, v] of Object.entries(a.spec)) cols[APPLICATOR_SPEC_COLUMNS[k]] = v;
      const custom: Record<string, unknown> = {};
      if (a.custom?.coil !== undefined) custom[coil.id] = a.custom.coil;
      if (a.custom?.shelf !== undefined) custom[shelf.id] = a.custom.shelf;
      const [row] = await trx('applicators')
        .insert({ organisation_id: org.id, site_id: siteId.get(a.site), line_id: lineId.get(a.line), tag: a.tag, custom: JSON.stringify(custom), created_by: author?.id ?? null, ...cols })
        .returning('id');
      ids.set(a.tag, row.id);

      // A reading about every four weeks, up to a few days ago; the wobble keeps the chart honest.
      if (!a.perDay || !a.history) continue;
      let count = Math.round(a.perDay * 30);
      for (let age = a.history, i = 0; age >= 3; age -= 28, i++) {
        const reset = a.tag === 'W-101' && i === 4;
        count = reset ? Math.round(a.perDay * 6) : count + Math.round(a.perDay * 28 * (1 + 0.08 * Math.sin(i * 1.7)));
        await trx('counter_readings').insert({
          organisation_id: org.id,
          applicator_id: row.id,
          read_on: daysAgo(age),
          count,
          counter_reset: reset,
          source: 'manual',
          note: reset ? 'Valve controller replaced; counter restarted' : null,
          recorded_by: tech?.id ?? null,
        });
      }
    }

    const reading = async (tag: string, age: number) =>
      trx('counter_readings')
        .where({ applicator_id: ids.get(tag) })
        .where('read_on', '<=', daysAgo(age))
        .orderBy([
          { column: 'read_on', order: 'desc' },
          { column: 'id', order: 'desc' },
        ])
        .first('id', 'count');
    const events = [
      {
        tag: 'V-312',
        age: 128,
        actions: ['seat-replaced', 'cleaned'],
        cause: 'seat-worn',
        parts: [{ name: 'Seat kit, 0.8 mm', partNumber: 'LK-SK-08', quantity: 1 }],
        notes: 'Drips after close. Wide frosted ring on the seat under the loupe.',
      },
      {
        tag: 'V-312',
        age: 44,
        actions: ['cleaned', 'nozzle-replaced'],
        cause: 'nozzle-blocked',
        parts: [{ name: 'Nozzle, single orifice 0.5 mm', partNumber: 'LK-NZ-05', quantity: 1 }],
        notes: 'Charred melt in the nozzle after a weekend stop.',
      },
      {
        tag: 'V-314',
        age: 100,
        actions: ['coil-replaced'],
        cause: 'coil-overheating',
        parts: [{ name: 'Coil, 24 V DC', partNumber: 'LK-CL-24', quantity: 1 }],
        notes: 'Coil ran hot; driver hold current set back to the work instruction.',
      },
      {
        tag: 'A-501',
        age: 72,
        actions: ['seals-replaced'],
        cause: null,
        parts: [
          { name: 'Seal kit, air valve', partNumber: 'LK-SL-12', quantity: 1 },
          { name: 'O-ring 6 × 1.5', partNumber: 'LK-OR-615', quantity: 2 },
        ],
        notes: 'Planned seal change.',
      },
      {
        tag: 'W-201',
        age: 20,
        actions: ['needle-replaced', 'seat-replaced'],
        cause: 'needle-chipped',
        parts: [
          { name: 'Needle, carbide ball', partNumber: 'LK-ND-TB', quantity: 1 },
          { name: 'Seat kit, 0.5 mm', partNumber: 'LK-SK-05', quantity: 1 },
        ],
        notes: 'Chip on the ball; seat notched by it.',
      },
    ];
    for (const e of events) {
      const r = await reading(e.tag, e.age);
      await trx('service_events').insert({
        organisation_id: org.id,
        applicator_id: ids.get(e.tag),
        performed_on: daysAgo(e.age),
        actions: e.actions,
        cause_code: e.cause,
        parts: JSON.stringify(e.parts),
        cycle_count: r ? Number(r.count) : null,
        reading_id: r?.id ?? null,
        performed_by: 'Dario Lindqvist',
        notes: e.notes,
        recorded_by: tech?.id ?? null,
      });
    }
  });
}
