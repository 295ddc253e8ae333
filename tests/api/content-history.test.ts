// The demo year in a real database: seeds 01-05 in demo mode, the history seed fast, written as
// planned, walks that replay from their stored answers, counters in order, no tag twice, and a
// second run that adds nothing.
import { createHash } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HISTORY_SEED, historyContext, planHistory } from '../../content/lib/history';
import type { Db } from '../../server/db/knex';
import type { GuideContent } from '../../src/shared/guides/schema';
import type { WalkAnswer } from '../../src/shared/walks/answers';
import { replayPath } from '../../src/shared/walks/walk-path';
import { DEMO_ORGANISATION, seed as seedOrganisation } from '../../seeds/01-demo-organisation';
import { seed as seedContent } from '../../seeds/02-demo-content';
import { seed as seedAssets } from '../../seeds/03-demo-assets';
import { seed as seedCases } from '../../seeds/04-demo-cases';
import { seed as seedHistory } from '../../seeds/05-demo-history';
import { createTestDatabase } from '../helpers/database';

let db: Db;
let drop: () => Promise<void>;
let orgId: number;
let seedMs = 0;
const env = { demo: process.env.BEADPATH_DEMO, files: process.env.FILES_DIR };

const HISTORY_TABLES = ['sites', 'lines', 'applicators', 'counter_readings', 'service_events', 'walks', 'walk_answers'] as const;

async function counts(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const t of HISTORY_TABLES) out[t] = Number((await db(t).count('* as n'))[0].n);
  return out;
}

beforeAll(async () => {
  ({ db, drop } = await createTestDatabase());
  process.env.BEADPATH_DEMO = '1';
  process.env.FILES_DIR = mkdtempSync(join(tmpdir(), 'beadpath-history-'));
  // Imported rather than run by Knex's seed runner, which cannot load TypeScript inside Vitest.
  for (const seed of [seedOrganisation, seedContent, seedAssets, seedCases]) await seed(db);
  const started = performance.now();
  await seedHistory(db);
  seedMs = performance.now() - started;
  orgId = (await db('organisations').where({ name: DEMO_ORGANISATION }).first('id')).id;
}, 120_000);

afterAll(async () => {
  process.env.BEADPATH_DEMO = env.demo;
  process.env.FILES_DIR = env.files;
  await drop?.();
});

describe('demo history seed', () => {
  it('when run on a fresh demo database, then it writes the year in well under five seconds', () => {
    expect(seedMs).toBeLessThan(5000);
  });

  it('when written, then the rows are the plan for today: the same counts and the same key fields', async () => {
    const ctx = await historyContext(db, orgId, { seed: HISTORY_SEED });
    const before = ['V-312', 'V-313', 'V-314', 'A-501', 'A-502', 'W-101', 'W-201', 'W-202'];
    const plan = planHistory({ scenario: ctx.scenario, guides: new Map([...ctx.guides].map(([k, g]) => [k, g.content])), random: ctx.random, today: ctx.today, skipTags: new Set(before) });
    const scenarioTags = plan.applicators.map((a) => a.tag);
    const readings = await db('counter_readings as r')
      .join('applicators as a', 'a.id', 'r.applicator_id')
      .whereIn('a.tag', scenarioTags)
      .orderBy('r.id')
      .select('a.tag', 'r.read_on', 'r.count', 'r.counter_reset');
    const services = await db('service_events as s')
      .join('applicators as a', 'a.id', 's.applicator_id')
      .whereIn('a.tag', scenarioTags)
      .orderBy('s.id')
      .select('a.tag', 's.performed_on', 's.actions', 's.cycle_count', 's.cause_code');
    const walks = await db('walks')
      .where({ organisation_id: orgId })
      .whereNotNull('applicator_id')
      .orderBy('id')
      .select('applicator', 'status', 'end_kind', 'outcome', 'cause_code', 'ended_at_step_id', 'answer_count', 'started_at');
    const day = (d: Date | string) => (typeof d === 'string' ? d : new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 10));
    const sum = (rows: unknown[]) => createHash('sha256').update(JSON.stringify(rows)).digest('hex');
    expect(readings.length).toBe(plan.readings.length);
    expect(services.length).toBe(plan.services.length);
    expect(walks.length).toBe(plan.walks.length);
    expect(sum(readings.map((r) => [r.tag, day(r.read_on), Number(r.count), r.counter_reset]))).toBe(sum(plan.readings.map((r) => [r.tag, r.readOn, r.count, r.counterReset])));
    expect(sum(services.map((s) => [s.tag, day(s.performed_on), s.actions, Number(s.cycle_count), s.cause_code]))).toBe(
      sum(plan.services.map((s) => [s.tag, s.performedOn, s.actions, s.cycleCount, s.causeCode])),
    );
    expect(sum(walks.map((w) => [w.applicator, w.status, w.end_kind, w.outcome, w.cause_code, w.ended_at_step_id, w.answer_count, new Date(w.started_at).toISOString()]))).toBe(
      sum(plan.walks.map((w) => [w.tag, w.status, w.endKind, w.outcome, w.causeCode, w.endedAtStepId, w.answers.length, w.startedAt])),
    );
  });

  it('when the scenario is added to what the assets seed made, then no tag appears twice in the organisation', async () => {
    const dupes = await db('applicators').where({ organisation_id: orgId }).select(db.raw('lower(tag) as tag')).count('* as n').groupByRaw('lower(tag)').havingRaw('count(*) > 1');
    expect(dupes).toEqual([]);
    expect(Number((await db('applicators').where({ organisation_id: orgId }).count('* as n'))[0].n)).toBe(8 + 21);
  });

  it('when each stored walk is replayed from its stored answers on its pinned version, then it ends as its row says', async () => {
    const walks = await db('walks as w')
      .join('guide_versions as v', 'v.id', 'w.guide_version_id')
      .where({ 'w.organisation_id': orgId })
      .select('w.id', 'w.status', 'w.end_kind', 'w.outcome', 'w.ended_at_step_id', 'v.content');
    const answers = await db('walk_answers')
      .whereIn(
        'walk_id',
        walks.map((w) => w.id),
      )
      .orderBy(['walk_id', 'seq'])
      .select('walk_id', 'client_id', 'payload');
    const byWalk = new Map<number, WalkAnswer[]>();
    for (const a of answers) byWalk.set(a.walk_id, [...(byWalk.get(a.walk_id) ?? []), { ...(a.payload as WalkAnswer), id: a.client_id }]);
    expect(walks.length).toBeGreaterThanOrEqual(300);
    for (const w of walks) {
      const state = replayPath(w.content as GuideContent, byWalk.get(w.id) ?? []);
      expect(state.problems).toEqual([]);
      expect(state.at).toBe(w.ended_at_step_id);
      if (w.status === 'abandoned') expect(state.ended).toBeNull();
      else expect(state.ended).toBe(w.end_kind);
      if (w.end_kind === 'finding') expect(state.outcome?.outcome).toBe(w.outcome);
    }
  });

  it('when every counter in the organisation is read in order, then it goes backwards only at a reading marked as a reset', async () => {
    const rows = await db('counter_readings').where({ organisation_id: orgId }).orderBy(['applicator_id', 'read_on', 'id']).select('applicator_id', 'count', 'counter_reset');
    let resets = 0;
    for (let i = 1; i < rows.length; i++) {
      if (rows[i].applicator_id !== rows[i - 1].applicator_id) continue;
      if (rows[i].counter_reset) resets++;
      else expect(Number(rows[i].count)).toBeGreaterThanOrEqual(Number(rows[i - 1].count));
    }
    // One from the assets seed, one from the history.
    expect(resets).toBe(2);
  });

  it('when the seed runs again, then it adds nothing', async () => {
    const first = await counts();
    await seedHistory(db);
    expect(await counts()).toEqual(first);
    expect(first.walks).toBeGreaterThanOrEqual(300);
  });
});
