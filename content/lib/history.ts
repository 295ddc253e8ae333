// The demo's year of history (counter readings, service events and walks), built on top of the
// demo content by seeds/05-demo-history.ts. The hook part gives a generator the scenario, the ids
// of the loaded guides and articles by their stable keys, a seeded random source and paths through
// a guide; the plan part turns those into the year's rows. See content/README.md.
import type { Knex } from 'knex';
import type { FindingStep, GuideContent, MeasureStep, Step } from '../../src/shared/guides/schema';
import type { WalkAnswer } from '../../src/shared/walks/answers';
import { nextStepFor, replayPath } from '../../src/shared/walks/walk-path';
import { SAMPLE_GUIDE_KEY, Scenario, readContent, type ContentSet } from './content';
import { APPLICATOR_SPEC_COLUMNS } from '../../server/modules/assets/assets.repository';

/** Everything a history generator gets. Ids are this database's; keys are content/'s. */
export interface HistoryContext {
  /** A transaction: the whole year goes in or none of it. */
  db: Knex;
  organisationId: number;
  /** content/scenario/larkfield.json, checked: sites, lines, people, 24 applicators, stories. */
  scenario: Scenario;
  /** Published guides by file key (e.g. 'bead-skips'): ids and the stored content walks follow. */
  guides: Map<string, { guideId: number; versionId: number; content: GuideContent }>;
  /** Published articles by key (= slug). */
  articles: Map<string, number>;
  /** Users by lower-case e-mail (the demo sign-ins of seeds/01-demo-organisation.ts). */
  users: Map<string, number>;
  /** Seeded random numbers in [0, 1): the same seed gives the same year. */
  random: () => number;
  /** The last day of the history; the year runs from 365 days before it. */
  today: Date;
}

/**
 * What the history seed implements (generateHistory below, called from seeds/05-demo-history.ts):
 *
 *   export async function seed(knex) {
 *     if (process.env.BEADPATH_DEMO !== '1') return;
 *     const org = await knex('organisations').where({ name: DEMO_ORGANISATION }).first();
 *     await knex.transaction(async (trx) => generateHistory(await historyContext(trx, org.id, { seed: 20261 })));
 *   }
 *
 * It must be idempotent like every seed (skip when the scenario's sites already exist) and only
 * insert: sites, lines and applicators from ctx.scenario, then counter_readings, service_events
 * and walks with their walk_answers, following the scenario's stories.
 */
export type HistoryGenerator = (ctx: HistoryContext) => Promise<void>;

/** mulberry32: small, fast and good enough for demo data; deterministic for a given seed. */
export function createRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Builds the context from what the demo content seed loaded. Guides are found by title and
 * articles by slug, the same way the loader finds them, so it works on any demo database.
 */
export async function historyContext(db: Knex, organisationId: number, opts: { seed: number; today?: Date; content?: ContentSet }): Promise<HistoryContext> {
  const set = opts.content ?? readContent();
  const scenario = Scenario.parse(set.scenario);
  const guides = new Map<string, { guideId: number; versionId: number; content: GuideContent }>();
  for (const g of set.guides) {
    if (!g.guide) continue;
    const row = await db('guides as g')
      .join('guide_versions as v', 'v.id', 'g.published_version_id')
      .where({ 'g.organisation_id': organisationId, 'v.title': g.guide.guide.title })
      .first('g.id as guideId', 'v.id as versionId', 'v.content as content');
    if (row) guides.set(g.key, { guideId: Number(row.guideId), versionId: Number(row.versionId), content: row.content as GuideContent });
  }
  const articles = new Map<string, number>();
  for (const row of await db('articles')
    .where({ organisation_id: organisationId })
    .whereIn(
      'slug',
      set.articles.map((a) => a.key),
    )
    .select('id', 'slug')) {
    articles.set(String(row.slug), Number(row.id));
  }
  const users = new Map<string, number>((await db('users').select('id', 'email')).map((r) => [String(r.email).toLowerCase(), Number(r.id)]));
  return { db, organisationId, scenario, guides, articles, users, random: createRandom(opts.seed), today: opts.today ?? new Date() };
}

/** One step of a walk's path and the branch taken out of it. */
export type PathEntry =
  | { stepId: string; kind: 'ask'; choiceId: string; next: string }
  | { stepId: string; kind: 'measure'; bandId: string; next: string }
  | { stepId: string; kind: 'try'; fixed: boolean; next: string | null }
  | { stepId: string; kind: 'finding'; causeCode: string }
  | { stepId: string; kind: 'handoff' };

/** Which branch to take at a step; return undefined to let the path pick at random. */
export type Steer = (step: Step) => string | boolean | undefined;

/**
 * A path from the start to an end (a Finding, a Hand-off or a Try that fixed it), choosing branches
 * at random unless `steer` names one (a choice or band id, or true/false for "fixed" on a Try).
 * The history seed turns each entry into walk answers; a Measure entry names its band, and the
 * generator picks a reading inside it (for a calculator step, a reading whose output lands there).
 */
export function walkPath(content: GuideContent, random: () => number, steer: Steer = () => undefined): PathEntry[] {
  const steps = new Map(content.steps.map((s) => [s.id, s]));
  const path: PathEntry[] = [];
  let id: string | null = content.startStepId;
  // Guides have no loops (the validator refuses them); the bound only guards a hand-edited file.
  for (let guard = 0; id !== null && guard < content.steps.length; guard++) {
    const step = steps.get(id);
    if (!step) break;
    const wanted = steer(step);
    if (step.kind === 'ask') {
      const choice = step.choices.find((c) => c.id === wanted) ?? step.choices[Math.floor(random() * step.choices.length)];
      path.push({ stepId: step.id, kind: 'ask', choiceId: choice.id, next: choice.next });
      id = choice.next;
    } else if (step.kind === 'measure') {
      const band = step.bands.find((b) => b.id === wanted) ?? step.bands[Math.floor(random() * step.bands.length)];
      path.push({ stepId: step.id, kind: 'measure', bandId: band.id, next: band.next });
      id = band.next;
    } else if (step.kind === 'try') {
      const fixed = typeof wanted === 'boolean' ? wanted : random() < 0.4;
      const next = fixed ? step.fixedNext : step.notFixedNext;
      path.push({ stepId: step.id, kind: 'try', fixed, next });
      id = next;
    } else if (step.kind === 'finding') {
      path.push({ stepId: step.id, kind: 'finding', causeCode: step.causeCode });
      id = null;
    } else {
      path.push({ stepId: step.id, kind: 'handoff' });
      id = null;
    }
  }
  return path;
}

/** The guide key of the long-standing demo guide, for generators that want the classic drip walk. */
export const DEMO_GUIDE_KEY = SAMPLE_GUIDE_KEY;

// ---------------------------------------------------------------------------------------------
// The year itself. planHistory is pure (scenario + guide contents + seed + today → rows to insert),
// so tests can check the stories and replay every walk without a database; generateHistory
// writes a plan into the demo organisation in one go.

/** The fixed seed of the demo year; change it and the whole year changes. */
export const HISTORY_SEED = 20261;
/** How far back the history goes. */
export const HISTORY_DAYS = 365;

const DAY = 86_400_000;
const MINUTE = 60_000;

export interface PlannedApplicator {
  tag: string;
  lineKey: string;
  siteKey: string;
  /** Column values of the applicators row (organisation, site and line ids are added on insert). */
  columns: Record<string, unknown>;
}

export interface PlannedReading {
  /** Position in the plan; service events point at readings by it. */
  ref: number;
  tag: string;
  readOn: string;
  count: number;
  counterReset: boolean;
  source: 'manual' | 'csv' | 'service';
  note: string | null;
  recordedBy: string;
}

export interface PlannedService {
  tag: string;
  performedOn: string;
  actions: string[];
  otherAction: string | null;
  causeCode: string | null;
  parts: { name: string; partNumber?: string; quantity: number }[];
  cycleCount: number;
  readingRef: number;
  performedBy: string;
  notes: string | null;
  walkRef: number | null;
  recordedBy: string;
  /** Which story put it there, for tests and for anyone reading the data; not stored. */
  story: string | null;
}

export interface PlannedWalk {
  ref: number;
  guideKey: string;
  tag: string;
  userEmail: string;
  status: 'ended' | 'abandoned';
  endKind: 'finding' | 'handoff' | 'fixed-by-try' | 'abandoned';
  outcome: 'fixed' | 'not-fixed' | 'fixed-by-other' | null;
  causeCode: string | null;
  outcomeNote: string | null;
  endedAtStepId: string;
  startedAt: string;
  endedAt: string;
  answers: WalkAnswer[];
  story: string | null;
}

export interface HistoryPlan {
  applicators: PlannedApplicator[];
  readings: PlannedReading[];
  services: PlannedService[];
  walks: PlannedWalk[];
}

export interface PlanInput {
  scenario: Scenario;
  guides: Map<string, GuideContent>;
  random: () => number;
  today: Date;
  /** Tags the organisation already has: their applicators are left as they are, without history. */
  skipTags?: ReadonlySet<string>;
}

type ScenarioApplicator = Scenario['applicators'][number] & Record<string, unknown>;

// The controller swap that restarts one counter: a planned event, not a story of its own.
const CONTROLLER_SWAP = { tags: ['V-103', 'V-101', 'G-501'], day: 212 };

const SEAT_LIFE = 100_000_000;
const SEAL_LIFE = 50_000_000;

// Causes that mean a wear part was renewed: only the wear simulation ends walks there, so the
// service records and the walks tell the same story.
const WEAR_CAUSES = new Set(['seat-worn', 'dynamic-seal-worn']);

// What a fixed finding leaves in the service record, when it leaves anything.
const SERVICE_FOR_CAUSE: Record<string, { actions: string[]; other?: string }> = {
  'seat-debris': { actions: ['cleaned'] },
  'nozzle-blocked': { actions: ['nozzle-replaced'] },
  'needle-chipped': { actions: ['needle-replaced'] },
  'coil-open': { actions: ['coil-replaced'] },
  'coil-shorted': { actions: ['coil-replaced'] },
  'cured-in-valve': { actions: ['cleaned'] },
  'filter-blocked': { actions: ['other'], other: 'Filter element changed' },
  'spring-fatigue': { actions: ['other'], other: 'Closing spring replaced' },
  'static-seal-leak': { actions: ['other'], other: 'Static seal replaced' },
  'heater-fault': { actions: ['other'], other: 'Heater cartridge replaced' },
  'air-valve-fault': { actions: ['other'], other: 'Air valve replaced' },
};

// "Fixed by something else": the cause really found and what the technician wrote.
const OTHER_FIXES: { cause: string; note: string }[] = [
  { cause: 'nozzle-blocked', note: 'Nozzle had a cured skin inside; fitted a clean one from the spares kit.' },
  { cause: 'filter-blocked', note: 'Inlet filter nearly closed with skins; changed the element.' },
  { cause: 'air-pressure-low', note: 'Shop air regulator had been turned down after a pneumatic job; set back to the work instruction.' },
  { cause: 'line-timing', note: 'Line speed had been raised on the panel without re-timing the glue pattern.' },
  { cause: 'supply-empty', note: 'Supply ran low between refills; refilled and purged.' },
  { cause: 'trigger-moved', note: 'Product sensor bracket knocked out of line; reset to the mark.' },
  { cause: 'temperature-wrong', note: 'Hose zone set point changed by a recipe load; restored it.' },
  { cause: 'air-in-fluid', note: 'Air drawn in at a loose suction fitting; tightened and purged.' },
];

const NOT_FIXED_NOTES = ['Parts on order; running with extra checks until they arrive.', 'Fault came back within the hour; engineer booked.', null, null];
const ABANDON_NOTES = ['Line restarted and the fault cleared for now.', 'Called away to a stoppage on another line.', null, null];
const FLOW_CHECK_NOTES = ['No scale at the line.', 'No time to collect for a minute with the line waiting.', 'Cup and scale not to hand.', null, null];

const isoDate = (d: Date) => d.toISOString().slice(0, 10);

/** Picks one entry, weighted. */
function pick<T>(random: () => number, items: readonly T[], weight: (t: T) => number = () => 1): T {
  const total = items.reduce((s, t) => s + weight(t), 0);
  let r = random() * total;
  for (const t of items) {
    r -= weight(t);
    if (r < 0) return t;
  }
  return items[items.length - 1];
}

// ---- Readings for Measure steps -------------------------------------------------------------

type ReadingFields = { value: number; unit: string; calculatorInputs?: Record<string, { value: number; unit: string }> };

// Inputs a technician types in besides the reading; the coil check wants the temperature of the
// coil when it was measured, and the shop floor is about 20 °C.
function extraInputs(step: MeasureStep): ReadingFields['calculatorInputs'] {
  if (step.calculator?.id === 'coil-check') return { measuredAt: { value: 20, unit: 'degC' } };
  return undefined;
}

function bandOf(step: MeasureStep, fields: ReadingFields): string | undefined {
  const route = nextStepFor(step, { id: 'probe-0000', stepId: step.id, answeredAt: new Date(0).toISOString(), kind: 'reading', ...fields });
  return route.ok ? route.bandId : undefined;
}

const tidy = (v: number) => Number(v.toPrecision(3));

// A calculator's band is found by trying readings, so the grid covers each reading kind's
// working range; values next to the band's edge look like a real fault, not a wild number.
function gridFor(step: MeasureStep): number[] {
  const out: number[] = [];
  if (step.reading.kind === 'temperature') for (let v = 10; v <= 260; v += 0.5) out.push(v);
  else for (let i = 0; i <= 600; i++) out.push(tidy(10 ** (-2 + (6 * i) / 600)));
  return out;
}

const calcCache = new WeakMap<MeasureStep, Map<string, number[]>>();

function calculatorCandidates(step: MeasureStep): Map<string, number[]> {
  const cached = calcCache.get(step);
  if (cached) return cached;
  const grid = gridFor(step);
  const bands = grid.map((value) => bandOf(step, { value, unit: step.reading.unit, calculatorInputs: extraInputs(step) }));
  const byBand = new Map<string, { value: number; edge: number }[]>();
  bands.forEach((band, i) => {
    if (!band) return;
    let edge = Infinity;
    for (let j = 1; j < grid.length && j < edge; j++) {
      if ((i - j >= 0 && bands[i - j] && bands[i - j] !== band) || (i + j < grid.length && bands[i + j] && bands[i + j] !== band)) edge = j;
    }
    const list = byBand.get(band) ?? [];
    list.push({ value: grid[i], edge });
    byBand.set(band, list);
  });
  const result = new Map<string, number[]>();
  for (const [band, list] of byBand) {
    list.sort((a, b) => a.edge - b.edge || a.value - b.value);
    result.set(
      band,
      list.slice(0, 15).map((c) => c.value),
    );
  }
  calcCache.set(step, result);
  return result;
}

function plainCandidate(step: MeasureStep, bandId: string, random: () => number): number | undefined {
  const band = step.bands.find((b) => b.id === bandId);
  if (!band) return undefined;
  for (let attempt = 0; attempt < 20; attempt++) {
    const r = random();
    let v: number;
    if (band.min !== null && band.max !== null) v = band.min + (band.max - band.min) * (0.15 + 0.7 * r);
    else if (band.max !== null) v = band.max > 0 ? band.max * (0.35 + 0.6 * r) : band.max - 1 - 10 * r;
    else if (band.min !== null) v = band.min > 0 ? band.min * (1.05 + 0.4 * r) : band.min + 1 + 10 * r;
    else v = r;
    v = tidy(v);
    if (bandOf(step, { value: v, unit: step.reading.unit }) === bandId) return v;
  }
  return undefined;
}

/** The bands a reading can actually reach, for steering. */
function reachableBands(step: MeasureStep): string[] {
  if (step.calculator) return [...calculatorCandidates(step).keys()];
  return step.bands.map((b) => b.id);
}

function readingFor(step: MeasureStep, bandId: string, random: () => number, hint?: number): ReadingFields {
  const unit = step.reading.unit;
  const calculatorInputs = extraInputs(step);
  const withInputs = (value: number): ReadingFields => (calculatorInputs ? { value, unit, calculatorInputs } : { value, unit });
  if (hint !== undefined && bandOf(step, withInputs(hint)) === bandId) return withInputs(hint);
  if (step.calculator) {
    const list = calculatorCandidates(step).get(bandId);
    if (list?.length) return withInputs(list[Math.floor(random() * list.length)]);
  } else {
    const v = plainCandidate(step, bandId, random);
    if (v !== undefined) return { value: v, unit };
  }
  throw new Error(`No reading lands in band '${bandId}' of step '${step.id}'`);
}

// ---- Walk logs --------------------------------------------------------------------------------

interface WalkSpec {
  guideKey: string;
  steer: Steer;
  /** Readings the simulation knows (cycles since the last seal kit...), by step id. */
  hints?: Record<string, number>;
  outcome: (finding: FindingStep) => { outcome: 'fixed' | 'not-fixed' | 'fixed-by-other'; note?: string; causeCode?: string };
  /** Stop at this step (or at the n-th step of the path) and leave the walk abandoned. */
  abandonAt?: string | number;
  abandonNote?: string | null;
}

interface BuiltWalk {
  answers: WalkAnswer[];
  path: PathEntry[];
  status: 'ended' | 'abandoned';
  endKind: PlannedWalk['endKind'];
  outcome: PlannedWalk['outcome'];
  causeCode: string | null;
  outcomeNote: string | null;
  endedAtStepId: string;
  endedAt: Date;
}

function buildWalk(content: GuideContent, spec: WalkSpec, random: () => number, ref: number, start: Date): BuiltWalk | null {
  const steps = new Map(content.steps.map((s) => [s.id, s]));
  const hints = spec.hints ?? {};
  const steer: Steer = (step) => {
    if (step.kind === 'measure') {
      const reachable = reachableBands(step);
      const hint = hints[step.id];
      if (hint !== undefined) {
        const band = bandOf(step, { value: hint, unit: step.reading.unit, calculatorInputs: extraInputs(step) });
        if (band) return band;
      }
      const wanted = spec.steer(step);
      if (typeof wanted === 'string' && reachable.includes(wanted)) return wanted;
      return reachable[Math.floor(random() * reachable.length)];
    }
    return spec.steer(step);
  };
  const path = walkPath(content, random, steer);
  const last = path[path.length - 1];
  if (!last || (last.kind !== 'finding' && last.kind !== 'handoff' && !(last.kind === 'try' && last.next === null))) return null;

  let stopAt = -1;
  if (typeof spec.abandonAt === 'string') stopAt = path.findIndex((p) => p.stepId === spec.abandonAt);
  else if (typeof spec.abandonAt === 'number') stopAt = Math.min(spec.abandonAt, path.length - 2);
  if (spec.abandonAt !== undefined && stopAt < 0) return null;

  const answers: WalkAnswer[] = [];
  let t = start.getTime();
  let seq = 0;
  const id = () => `hist-${String(ref).padStart(4, '0')}-${String(++seq).padStart(2, '0')}`;
  const at = (gapMs: number) => new Date((t += gapMs)).toISOString();
  let result: Pick<BuiltWalk, 'status' | 'endKind' | 'outcome' | 'causeCode' | 'outcomeNote' | 'endedAtStepId'> | null = null;

  for (let i = 0; i < path.length; i++) {
    const entry = path[i];
    const step = steps.get(entry.stepId)!;
    const reading = 40_000 + random() * 50_000;
    if (i === stopAt) {
      // Some read the cautions before giving up, most give up on reading what the step asks for.
      if (step.cautions.length && random() < 0.5) answers.push({ id: id(), stepId: step.id, answeredAt: at(reading), kind: 'acknowledge', cautionIds: step.cautions.map((c) => c.id) });
      t += 2 * MINUTE + random() * 6 * MINUTE;
      result = { status: 'abandoned', endKind: 'abandoned', outcome: null, causeCode: null, outcomeNote: spec.abandonNote ?? null, endedAtStepId: step.id };
      break;
    }
    if (step.cautions.length) answers.push({ id: id(), stepId: step.id, answeredAt: at(reading), kind: 'acknowledge', cautionIds: step.cautions.map((c) => c.id) });
    const work = (step.kind === 'try' || step.kind === 'measure' ? 3 : 0.5) * MINUTE + random() * 4 * MINUTE;
    if (entry.kind === 'ask') answers.push({ id: id(), stepId: step.id, answeredAt: at(work), kind: 'choice', choiceId: entry.choiceId });
    else if (entry.kind === 'measure') answers.push({ id: id(), stepId: step.id, answeredAt: at(work), kind: 'reading', ...readingFor(step as MeasureStep, entry.bandId, random, hints[step.id]) });
    else if (entry.kind === 'try') {
      answers.push({ id: id(), stepId: step.id, answeredAt: at(work + 5 * MINUTE), kind: 'try', fixed: entry.fixed });
      if (entry.next === null) result = { status: 'ended', endKind: 'fixed-by-try', outcome: 'fixed', causeCode: null, outcomeNote: null, endedAtStepId: step.id };
    } else if (entry.kind === 'finding') {
      const finding = step as FindingStep;
      const o = spec.outcome(finding);
      const minutes = (finding.typicalMinutes ?? 20) * MINUTE * (0.8 + 0.6 * random());
      answers.push({
        id: id(),
        stepId: step.id,
        answeredAt: at(minutes),
        kind: 'finding-outcome',
        outcome: o.outcome,
        ...(o.note ? { note: o.note } : {}),
        ...(o.outcome === 'fixed-by-other' ? { causeCode: o.causeCode } : {}),
      });
      const causeCode = o.outcome === 'fixed-by-other' ? o.causeCode! : o.outcome === 'fixed' ? finding.causeCode : null;
      result = { status: 'ended', endKind: 'finding', outcome: o.outcome, causeCode, outcomeNote: o.note?.trim() || null, endedAtStepId: step.id };
    } else {
      t += 2 * MINUTE;
      result = { status: 'ended', endKind: 'handoff', outcome: null, causeCode: null, outcomeNote: null, endedAtStepId: step.id };
    }
  }
  if (!result) return null;
  return { answers, path, ...result, endedAt: new Date(t) };
}

/** Whether a planned walk's log replays to exactly the end, step and outcome stored with it. */
export function walkReplays(content: GuideContent, walk: Pick<PlannedWalk, 'answers' | 'status' | 'endKind' | 'outcome' | 'endedAtStepId' | 'causeCode'>): string | null {
  const state = replayPath(content, walk.answers);
  if (state.problems.length) return state.problems.map((p) => p.message).join('; ');
  if (state.at !== walk.endedAtStepId) return `replay stops at '${state.at}', not '${walk.endedAtStepId}'`;
  if (walk.status === 'abandoned') return state.ended === null && state.current === walk.endedAtStepId ? null : 'an abandoned walk replays to an end';
  if (state.ended !== walk.endKind) return `replay ends with '${state.ended}', not '${walk.endKind}'`;
  if (walk.endKind === 'finding') {
    if (state.outcome?.outcome !== walk.outcome) return `replay outcome '${state.outcome?.outcome}', not '${walk.outcome}'`;
    const finding = content.steps.find((s) => s.id === state.at);
    const cause = state.outcome.outcome === 'fixed-by-other' ? (state.outcome.causeCode ?? null) : state.outcome.outcome === 'fixed' && finding?.kind === 'finding' ? finding.causeCode : null;
    if (cause !== walk.causeCode) return `replay cause '${cause}', not '${walk.causeCode}'`;
  }
  return null;
}

// ---- The simulation -----------------------------------------------------------------------------

interface Sim {
  app: ScenarioApplicator;
  tag: string;
  electric: boolean;
  siteKey: string;
  counter: number;
  /** Wear as a share of the part's life; the part fails when it reaches its threshold. */
  seatWear: number;
  seatThreshold: number;
  sealWear: number;
  sealThreshold: number;
  sinceSeat: number;
  sinceSeals: number;
  /** Cycles the current seat has run on the filled glue. */
  onFiller: number;
  lastReadingRef: number;
}

function num(params: Record<string, unknown>, key: string, fallback: number): number {
  const v = params[key];
  return typeof v === 'number' && Number.isFinite(v) ? v : fallback;
}

function str(params: Record<string, unknown>, key: string, fallback: string): string {
  const v = params[key];
  return typeof v === 'string' ? v : fallback;
}

/** The plant shutdown a date falls in, if any: both plants close over the year end, Larkfield Works also for two weeks in August. */
function shutdown(siteKey: string, date: Date): string | null {
  const m = date.getUTCMonth();
  const day = date.getUTCDate();
  if ((m === 11 && day >= 24) || (m === 0 && day <= 1)) return 'year-end';
  if (siteKey === 'larkfield-works' && m === 7 && day >= 3 && day <= 16) return 'summer';
  return null;
}

/** The whole year as rows, from the scenario and a seeded random source; no database involved. */
export function planHistory(input: PlanInput): HistoryPlan {
  const { scenario, guides, random } = input;
  const skip = new Set([...(input.skipTags ?? [])].map((t) => t.toLowerCase()));
  const today = new Date(Date.UTC(input.today.getUTCFullYear(), input.today.getUTCMonth(), input.today.getUTCDate()));
  const dayDate = (d: number) => new Date(today.getTime() - (HISTORY_DAYS - d) * DAY);
  const story = (key: string) => scenario.stories.find((s) => s.key === key)?.params ?? {};
  const seatStory = story('seat-failures-after-fluid-change');
  const sealStory = story('fast-seal-wear-on-sealant');
  const skipStory = story('abandoned-flow-check');
  const mondayStory = story('monday-cold-starts');
  const changeDay = num(seatStory, 'changeAfterDays', 150);
  const seatLine = str(seatStory, 'line', 'ov-line-4');
  const sealantFluid = str(sealStory, 'fluid', '');
  const mondayLine = str(mondayStory, 'line', 'lw-line-2');
  const lineOf = new Map(scenario.lines.map((l) => [l.key, l]));
  const people = new Map(scenario.people.filter((p) => p.email).map((p) => [p.email!, p.name]));

  const plan: HistoryPlan = { applicators: [], readings: [], services: [], walks: [] };
  const sims: Sim[] = [];
  for (const raw of scenario.applicators) {
    const app = raw as ScenarioApplicator;
    const tag = String(app.tag);
    if (skip.has(tag.toLowerCase())) continue;
    const line = lineOf.get(app.line);
    if (!line) continue;
    const columns: Record<string, unknown> = {};
    for (const [k, col] of Object.entries(APPLICATOR_SPEC_COLUMNS)) if (app[k] !== undefined) columns[col] = app[k];
    // The row is the valve as it is today: Line 4 runs the filled glue since the change.
    if (app.line === seatLine && app.fluidName === seatStory.fromFluid && typeof seatStory.toFluid === 'string') {
      columns.fluid_name = seatStory.toFluid;
      columns.hours_per_day = num(seatStory, 'hoursPerDayAfterChange', Number(app.hoursPerDay));
      columns.days_per_week = num(seatStory, 'daysPerWeekAfterChange', Number(app.daysPerWeek));
    }
    plan.applicators.push({ tag, lineKey: app.line, siteKey: line.site, columns });
    const seatThreshold = 0.85 + 0.3 * random();
    const sealThreshold = 0.85 + 0.3 * random();
    const seatWear = 0.1 + 0.55 * random();
    const sealWear = 0.05 + 0.6 * random();
    sims.push({
      app,
      tag,
      electric: app.actuation === 'electric',
      siteKey: line.site,
      counter: app.cyclesAtStart,
      seatWear,
      seatThreshold,
      sealWear,
      sealThreshold,
      sinceSeat: Math.round(seatWear * SEAT_LIFE),
      sinceSeals: Math.round(sealWear * (app.fluidName === sealantFluid ? num(sealStory, 'historySealLifeCycles', 1_800_000) : SEAL_LIFE)),
      onFiller: 0,
      lastReadingRef: -1,
    });
  }
  const swapTag = CONTROLLER_SWAP.tags.find((t) => sims.some((s) => s.tag === t));

  // Who walks: the technicians of the site, now and then the support desk on a call.
  const walkersFor = (siteKey: string) => {
    const local = scenario.people.filter((p) => p.email && p.site === siteKey && p.email !== 'admin@example.com').map((p) => p.email!);
    return [...local, 'tech@example.com', 'support@example.com'].filter((e, i, a) => a.indexOf(e) === i);
  };
  const walkerFor = (siteKey: string) => pick(random, walkersFor(siteKey), (e) => (e === 'support@example.com' ? 0.4 : e === 'tech@example.com' ? 1.5 : 1));

  const addReading = (sim: Sim, d: number, source: PlannedReading['source'], who: string, reset = false, note: string | null = null) => {
    const ref = plan.readings.length;
    plan.readings.push({ ref, tag: sim.tag, readOn: isoDate(dayDate(d)), count: sim.counter, counterReset: reset, source, note, recordedBy: who });
    sim.lastReadingRef = ref;
    return ref;
  };

  const addService = (sim: Sim, d: number, who: string, s: Omit<PlannedService, 'tag' | 'performedOn' | 'cycleCount' | 'readingRef' | 'performedBy' | 'recordedBy'>) => {
    const readingRef = addReading(sim, d, 'service', who);
    plan.services.push({ tag: sim.tag, performedOn: isoDate(dayDate(d)), cycleCount: sim.counter, readingRef, performedBy: people.get(who) ?? who, recordedBy: who, ...s });
  };

  const addWalk = (sim: Sim, d: number, spec: WalkSpec, who: string, storyKey: string | null, startMinutes: number): PlannedWalk | null => {
    const content = guides.get(spec.guideKey);
    if (!content) return null;
    const ref = plan.walks.length + 1;
    const start = new Date(dayDate(d).getTime() + startMinutes * MINUTE);
    const built = buildWalk(content, spec, random, ref, start);
    if (!built) return null;
    const walk: PlannedWalk = {
      ref,
      guideKey: spec.guideKey,
      tag: sim.tag,
      userEmail: who,
      status: built.status,
      endKind: built.endKind,
      outcome: built.outcome,
      causeCode: built.causeCode,
      outcomeNote: built.outcomeNote,
      endedAtStepId: built.endedAtStepId,
      startedAt: start.toISOString(),
      endedAt: built.endedAt.toISOString(),
      answers: built.answers,
      story: storyKey,
    };
    // A walk that would not replay to what is stored must never reach the database.
    if (walkReplays(content, walk) !== null) return null;
    plan.walks.push(walk);
    return walk;
  };

  const dayShift = () => 6 * 60 + random() * 13 * 60;
  const electricOrAir =
    (sim: Sim): Steer =>
    (step) => {
      if (step.kind !== 'ask') return undefined;
      const ids = step.choices.map((c) => c.id);
      if (ids.includes('electric') && ids.includes('air')) return sim.electric ? 'electric' : 'air';
      if (ids.includes('hot-melt') && ids.includes('other')) return sim.app.fluidFamily === 'hot-melt' ? 'hot-melt' : 'other';
      return undefined;
    };
  const fixedOutcome = () => ({ outcome: 'fixed' as const });

  let skipWalks = 0;
  const skipShare = num(skipStory, 'abandonShare', 0.45);
  const skipGuide = str(skipStory, 'guide', 'bead-skips');
  const skipStep = str(skipStory, 'step', 'flow-check');

  // Background faults: which guides fit which valve, bead skips the most common complaint.
  const background = (sim: Sim, d: number) => {
    const eligible = [...guides.keys()].filter((key) => {
      if (key.endsWith('-electric') || key === 'coil-running-hot') return sim.electric;
      if (key.endsWith('-air')) return !sim.electric;
      if (key === 'hot-melt-stringing') return sim.app.fluidFamily === 'hot-melt';
      return true;
    });
    const guideKey = pick(random, eligible, (k) => (k === skipGuide ? 2 : 1));
    const who = walkerFor(sim.siteKey);
    const base = electricOrAir(sim);
    let abandonAt: string | number | undefined;
    let abandonNote: string | null = null;
    let steer = base;
    if (guideKey === skipGuide) {
      // A fixed share, not a coin toss, so the story holds for any seed.
      const abandon = Math.floor((skipWalks + 1) * skipShare) > Math.floor(skipWalks * skipShare);
      skipWalks++;
      if (abandon) {
        abandonAt = skipStep;
        abandonNote = pick(random, FLOW_CHECK_NOTES);
        steer = (step) => {
          if (step.id === 'skip-pattern') return random() < 0.6 ? 'random' : 'thinning';
          if (step.id === 'supply-pressure') return 'holds';
          return base(step);
        };
      }
    } else if (random() < 0.05) {
      abandonAt = 1 + Math.floor(random() * 3);
      abandonNote = pick(random, ABANDON_NOTES);
    }
    const outcome = () => {
      const r = random();
      if (r < 0.72) return { outcome: 'fixed' as const };
      if (r < 0.86) return { outcome: 'not-fixed' as const, note: pick(random, NOT_FIXED_NOTES) ?? undefined };
      const other = pick(random, OTHER_FIXES);
      return { outcome: 'fixed-by-other' as const, causeCode: other.cause, note: other.note };
    };
    const excluded = new Set(WEAR_CAUSES);
    if (sim.app.line === mondayLine) excluded.add(str(mondayStory, 'cause', 'temperature-wrong'));
    for (let attempt = 0; attempt < 6; attempt++) {
      const content = guides.get(guideKey)!;
      const hints = { 'seal-cycles': sim.sinceSeals, 'seat-cycles': sim.sinceSeat };
      const trial = buildWalk(content, { guideKey, steer, hints, outcome, abandonAt, abandonNote }, random, 0, new Date(0));
      if (!trial) continue;
      const end = content.steps.find((s) => s.id === trial.endedAtStepId);
      if (end?.kind === 'finding' && trial.status === 'ended' && excluded.has(end.causeCode)) continue;
      // Re-run the accepted walk for real; the seeded source moves on, so steer it onto the same path.
      const taken = new Map(trial.path.map((p) => [p.stepId, p]));
      const replaySteer: Steer = (step) => {
        const p = taken.get(step.id);
        if (!p) return undefined;
        return p.kind === 'ask' ? p.choiceId : p.kind === 'measure' ? p.bandId : p.kind === 'try' ? p.fixed : undefined;
      };
      const endStep = trial.endedAtStepId;
      const o = trial.answers.find((a) => a.kind === 'finding-outcome');
      const walk = addWalk(
        sim,
        d,
        {
          guideKey,
          steer: replaySteer,
          hints,
          outcome: () => (o && o.kind === 'finding-outcome' ? { outcome: o.outcome, note: o.note, causeCode: o.causeCode } : { outcome: 'fixed' }),
          abandonAt: trial.status === 'abandoned' ? endStep : undefined,
          abandonNote: trial.outcomeNote,
        },
        who,
        abandonAt === skipStep ? 'abandoned-flow-check' : null,
        dayShift(),
      );
      if (!walk) return;
      if (walk.status === 'ended' && walk.endKind === 'finding' && (walk.outcome === 'fixed' || walk.outcome === 'fixed-by-other') && walk.causeCode) {
        const service = SERVICE_FOR_CAUSE[walk.causeCode];
        if (!service) return;
        const finding = content.steps.find((s) => s.id === walk.endedAtStepId) as FindingStep;
        addService(sim, d, who, {
          actions: service.actions,
          otherAction: service.other ?? null,
          causeCode: walk.causeCode,
          parts: walk.outcome === 'fixed' ? finding.parts.map((p) => ({ ...p })) : [],
          notes: walk.outcome === 'fixed' ? `${finding.title}. ${finding.remedy[0] ?? ''}`.trim() : walk.outcomeNote,
          walkRef: walk.ref,
          story: null,
        });
      }
      return;
    }
  };

  for (let d = 0; d <= HISTORY_DAYS; d++) {
    const date = dayDate(d);
    const weekday = date.getUTCDay(); // 0 Sunday … 6 Saturday
    for (const sim of sims) {
      // Line 4 took on the new label contract with the new glue and went to more shifts.
      const changed = sim.app.line === seatLine && d >= changeDay;
      const days = changed ? num(seatStory, 'daysPerWeekAfterChange', Number(sim.app.daysPerWeek ?? 5)) : Number(sim.app.daysPerWeek ?? 5);
      const hours = changed ? num(seatStory, 'hoursPerDayAfterChange', Number(sim.app.hoursPerDay ?? 0)) : Number(sim.app.hoursPerDay ?? 0);
      const shut = shutdown(sim.siteKey, date);
      const working = !shut && (weekday >= 1 && weekday <= Math.min(6, days) ? true : days >= 7);
      const running = sim.app.status === 'running';
      const who = sim.siteKey === 'orrin-vale' ? 'author2@example.com' : 'tech@example.com';
      if (d === 0) addReading(sim, d, 'manual', who);
      if (!running) continue;

      if (d === changeDay && sim.app.line === seatLine) {
        addService(sim, d, who, {
          actions: ['cleaned'],
          otherAction: null,
          causeCode: null,
          parts: [],
          notes: `Flushed and changed over from ${str(seatStory, 'fromFluid', 'the old glue')} to ${str(seatStory, 'toFluid', 'the new glue')}.`,
          walkRef: null,
          story: 'seat-failures-after-fluid-change',
        });
      }
      if (d === CONTROLLER_SWAP.day && sim.tag === swapTag) {
        plan.services.push({
          tag: sim.tag,
          performedOn: isoDate(date),
          actions: ['other'],
          otherAction: 'Valve controller replaced',
          causeCode: 'driver-fault',
          parts: [{ name: 'Valve controller', partNumber: 'BP-CTL-24', quantity: 1 }],
          cycleCount: 0,
          readingRef: -1,
          performedBy: people.get(who) ?? who,
          notes: 'Controller display failed; swapped for the spare. Its counter starts again from zero.',
          walkRef: null,
          recordedBy: who,
          story: null,
        });
        sim.counter = 0;
        plan.services[plan.services.length - 1].readingRef = addReading(sim, d, 'service', who, true, 'Valve controller replaced; counter restarted');
      }
      // Hot-melt guns get their planned clean and a fresh nozzle on the first day of a shutdown.
      if (shut && !shutdown(sim.siteKey, dayDate(d - 1)) && sim.app.fluidFamily === 'hot-melt') {
        addService(sim, d, who, {
          actions: ['cleaned', 'nozzle-replaced'],
          otherAction: null,
          causeCode: null,
          parts: [{ name: 'Nozzle', partNumber: String(sim.app.nozzle ?? 'BP-NZ').split(',')[0], quantity: 1 }],
          notes: `Planned clean and nozzle change in the ${shut} shutdown.`,
          walkRef: null,
          story: null,
        });
      }
      // Today is still under way: its walks and faults are not history yet.
      if (!working || d === HISTORY_DAYS) continue;

      // Wear parts that reached their limit fail today, and a walk finds them.
      if (sim.seatWear >= sim.seatThreshold) {
        const afterChange = sim.app.line === seatLine && d >= changeDay;
        const guideKey = sim.electric ? 'drips-after-close-electric' : 'drips-after-close-air';
        const walker = walkerFor(sim.siteKey);
        const walk = addWalk(
          sim,
          d,
          {
            guideKey,
            steer: (step) => (step.id === 'drip-when' ? 'between-shots' : step.id === 'clean-seat' ? false : step.id === 'seat-inspect' ? 'seat-ring' : undefined),
            outcome: fixedOutcome,
          },
          walker,
          afterChange ? 'seat-failures-after-fluid-change' : null,
          dayShift(),
        );
        const finding = walk ? (guides.get(guideKey)!.steps.find((s) => s.id === walk.endedAtStepId) as FindingStep) : undefined;
        addService(sim, d, walker, {
          actions: ['seat-replaced', 'cleaned'],
          otherAction: null,
          causeCode: 'seat-worn',
          parts: finding?.parts.map((p) => ({ ...p })) ?? [],
          notes: afterChange
            ? `Drips between shots. Seat worn to a wide frosted ring after ${Math.round(sim.sinceSeat / 1e6)} million cycles, ${sim.onFiller >= sim.sinceSeat ? 'all' : `${Math.round(sim.onFiller / 1e6)} million`} of them on the filled glue.`
            : `Drips between shots. Seat worn after ${Math.round(sim.sinceSeat / 1e6)} million cycles.`,
          walkRef: walk?.ref ?? null,
          story: afterChange ? 'seat-failures-after-fluid-change' : null,
        });
        sim.seatWear = 0;
        sim.sinceSeat = 0;
        sim.onFiller = 0;
        // Filler wears a seat evenly, so seats on the filled glue fail within a narrower spread.
        sim.seatThreshold = afterChange ? 0.8 + 0.35 * random() : 0.85 + 0.3 * random();
      }
      if (!sim.electric && sim.sealWear >= sim.sealThreshold) {
        const sealant = sim.app.fluidName === sealantFluid;
        const walker = walkerFor(sim.siteKey);
        const walk = addWalk(
          sim,
          d,
          {
            guideKey: 'seal-weep-air',
            hints: { 'seal-cycles': sim.sinceSeals },
            steer: (step) => {
              if (step.id === 'weep-where') return 'weep-hole';
              if (step.id === 'weep-rate') return random() < 0.7 ? 'film' : 'run';
              if (step.id === 'fluid-change') return 'same';
              if (step.id === 'fluid-pressure') return 'within';
              if (step.id === 'filled-fluid') return sealant ? 'filled' : 'unfilled';
              if (step.id === 'shaft-inspect') return 'smooth';
              return undefined;
            },
            outcome: fixedOutcome,
          },
          walker,
          sealant ? 'fast-seal-wear-on-sealant' : null,
          dayShift(),
        );
        const finding = walk ? (guides.get('seal-weep-air')!.steps.find((s) => s.id === walk.endedAtStepId) as FindingStep) : undefined;
        addService(sim, d, walker, {
          actions: ['seals-replaced'],
          otherAction: null,
          causeCode: 'dynamic-seal-worn',
          parts: finding?.parts.map((p) => ({ ...p })) ?? [],
          notes: sealant
            ? `Weep at the weep hole after ${(sim.sinceSeals / 1e6).toFixed(1)} million cycles; seal lips scored by the filler in the sealant.`
            : `Weep at the weep hole after ${Math.round(sim.sinceSeals / 1e6)} million cycles.`,
          walkRef: walk?.ref ?? null,
          story: sealant ? 'fast-seal-wear-on-sealant' : null,
        });
        sim.sealWear = 0;
        sim.sinceSeals = 0;
        sim.sealThreshold = 0.85 + 0.3 * random();
      }

      // Monday cold starts: the melt in the guns is not up to temperature at the first shift.
      if (weekday === 1 && sim.app.story === 'monday-cold-starts') {
        const month = date.getUTCMonth();
        const winter = month >= 10 || month <= 2;
        if (random() < (winter ? 0.55 : 0.3)) {
          addWalk(
            sim,
            d,
            {
              guideKey: str(mondayStory, 'guide', 'placement-drift'),
              steer: (step) => (step.id === 'drift-pattern' ? 'late-or-long' : step.id === 'melt-temp' ? 'thick' : undefined),
              outcome: () =>
                random() < 0.85
                  ? { outcome: 'fixed', note: random() < 0.4 ? 'Waited for the guns to reach set point before restarting.' : undefined }
                  : { outcome: 'not-fixed', note: 'Still late after warming; engineer to look at the hose zone.' },
            },
            walkerFor(sim.siteKey),
            'monday-cold-starts',
            6 * 60 + random() * 90,
          );
        }
      } else if (random() < 0.05) {
        background(sim, d);
      }

      // The day's production, then the wear it caused.
      const util = 0.78 + 0.17 * random();
      const cycles = Math.round(Number(sim.app.cyclesPerMinute ?? 0) * 60 * hours * util);
      sim.counter += cycles;
      sim.sinceSeat += cycles;
      sim.sinceSeals += cycles;
      if (sim.app.line === seatLine && d >= changeDay) sim.onFiller += cycles;
      const seatLife = sim.app.line === seatLine && d >= changeDay ? num(seatStory, 'seatLifeAfterCycles', 25_000_000) : num(seatStory, 'seatLifeBeforeCycles', SEAT_LIFE);
      const sealLife = sim.app.fluidName === sealantFluid ? num(sealStory, 'historySealLifeCycles', 1_800_000) : num(sealStory, 'otherSealLifeCycles', SEAL_LIFE);
      sim.seatWear += cycles / seatLife;
      sim.sealWear += cycles / sealLife;

      // Counters are read on Fridays, now and then missed; Orrin Vale sends its export weekly.
      if (weekday === 5 && d < HISTORY_DAYS && random() < 0.92) addReading(sim, d, sim.siteKey === 'orrin-vale' ? 'csv' : 'manual', who);
    }
  }
  // The latest count for every valve, so the dashboard's "cycles now" is this week's.
  for (const sim of sims)
    if (sim.app.status === 'running' && plan.readings[sim.lastReadingRef]?.readOn !== isoDate(dayDate(HISTORY_DAYS)))
      addReading(sim, HISTORY_DAYS, 'manual', sim.siteKey === 'orrin-vale' ? 'author2@example.com' : 'tech@example.com');
  return plan;
}

// ---- Writing the plan ---------------------------------------------------------------------------

/** The organisation already has a year behind it: the scenario's first plant, or walks a month old. */
export async function hasHistory(db: Knex, organisationId: number, scenario: Scenario): Promise<boolean> {
  const site = scenario.sites[0];
  if (site && (await db('sites').where({ organisation_id: organisationId }).whereRaw('lower(name) = lower(?)', [site.name]).first('id'))) return true;
  const old = await db('walks')
    .where({ organisation_id: organisationId })
    .where('started_at', '<', new Date(Date.now() - 30 * DAY))
    .first('id');
  return Boolean(old);
}

// Multi-row inserts in chunks: a handful of round trips for the whole year, within PostgreSQL's
// limit on bound parameters.
async function insertAll(db: Knex, table: string, rows: Record<string, unknown>[], returning = false): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    if (returning) ids.push(...(await db(table).insert(chunk).returning('id')).map((r: { id: number }) => Number(r.id)));
    else await db(table).insert(chunk);
  }
  return ids;
}

/** Writes the demo year into ctx.organisationId; does nothing when it already has one. */
export const generateHistory: HistoryGenerator = async (ctx) => {
  const { db, organisationId: org, scenario } = ctx;
  if (await hasHistory(db, org, scenario)) return;
  const existing = await db('applicators').where({ organisation_id: org }).pluck('tag');
  const guides = new Map([...ctx.guides].map(([k, g]) => [k, g.content]));
  const plan = planHistory({ scenario, guides, random: ctx.random, today: ctx.today, skipTags: new Set(existing.map(String)) });
  const user = (email: string) => ctx.users.get(email.toLowerCase()) ?? null;

  const siteId = new Map<string, number>();
  for (const s of scenario.sites) {
    const found = await db('sites').where({ organisation_id: org }).whereRaw('lower(name) = lower(?)', [s.name]).first('id');
    siteId.set(s.key, found ? found.id : (await db('sites').insert({ organisation_id: org, name: s.name, address: s.address, contact: s.contact }).returning('id'))[0].id);
  }
  const lineId = new Map<string, number>();
  for (const l of scenario.lines) {
    const site = siteId.get(l.site)!;
    const found = await db('lines').where({ site_id: site }).whereRaw('lower(name) = lower(?)', [l.name]).first('id');
    lineId.set(l.key, found ? found.id : (await db('lines').insert({ organisation_id: org, site_id: site, name: l.name, area: l.area, contact: l.contact }).returning('id'))[0].id);
  }
  const appIds = await insertAll(
    db,
    'applicators',
    plan.applicators.map((a) => ({ organisation_id: org, site_id: siteId.get(a.siteKey), line_id: lineId.get(a.lineKey), tag: a.tag, created_by: user('admin@example.com'), ...a.columns })),
    true,
  );
  const appId = new Map(plan.applicators.map((a, i) => [a.tag, appIds[i]]));
  const appOf = new Map(plan.applicators.map((a) => [a.tag, a]));

  const readingIds = await insertAll(
    db,
    'counter_readings',
    plan.readings.map((r) => ({
      organisation_id: org,
      applicator_id: appId.get(r.tag),
      read_on: r.readOn,
      count: r.count,
      counter_reset: r.counterReset,
      source: r.source,
      note: r.note,
      recorded_by: user(r.recordedBy),
      created_at: new Date(`${r.readOn}T16:00:00Z`),
    })),
    true,
  );

  const lineName = new Map(scenario.lines.map((l) => [l.key, l.name]));
  const siteName = new Map(scenario.sites.map((s) => [s.key, s.name]));
  const fallbackUser = user('tech@example.com') ?? [...ctx.users.values()][0];
  const walks = plan.walks.filter((w) => ctx.guides.has(w.guideKey));
  const walkIds = await insertAll(
    db,
    'walks',
    walks.map((w) => {
      const g = ctx.guides.get(w.guideKey)!;
      const a = appOf.get(w.tag)!;
      return {
        organisation_id: org,
        guide_id: g.guideId,
        guide_version_id: g.versionId,
        user_id: user(w.userEmail) ?? fallbackUser,
        site: siteName.get(a.siteKey),
        line: lineName.get(a.lineKey),
        applicator: w.tag,
        applicator_id: appId.get(w.tag),
        status: w.status,
        current_step_id: w.endedAtStepId,
        ended_at_step_id: w.endedAtStepId,
        end_kind: w.endKind,
        outcome: w.outcome,
        cause_code: w.causeCode,
        outcome_note: w.outcomeNote,
        answer_count: w.answers.length,
        started_at: w.startedAt,
        ended_at: w.endedAt,
        updated_at: w.endedAt,
      };
    }),
    true,
  );
  const walkId = new Map(walks.map((w, i) => [w.ref, walkIds[i]]));
  const answers: Record<string, unknown>[] = [];
  walks.forEach((w, i) =>
    w.answers.forEach((a, seq) => {
      answers.push({
        walk_id: walkIds[i],
        seq: seq + 1,
        client_id: a.id,
        kind: a.kind,
        step_id: a.stepId,
        payload: JSON.stringify(a),
        answered_at: a.answeredAt,
        received_at: new Date(Date.parse(a.answeredAt) + 2000),
      });
    }),
  );
  await insertAll(db, 'walk_answers', answers);

  await insertAll(
    db,
    'service_events',
    plan.services.map((s) => ({
      organisation_id: org,
      applicator_id: appId.get(s.tag),
      performed_on: s.performedOn,
      actions: s.actions,
      other_action: s.otherAction,
      cause_code: s.causeCode,
      parts: JSON.stringify(s.parts),
      cycle_count: s.cycleCount,
      reading_id: s.readingRef >= 0 ? readingIds[s.readingRef] : null,
      performed_by: s.performedBy,
      notes: s.notes,
      walk_id: s.walkRef !== null ? (walkId.get(s.walkRef) ?? null) : null,
      recorded_by: user(s.recordedBy),
      created_at: new Date(`${s.performedOn}T17:00:00Z`),
    })),
  );
};
