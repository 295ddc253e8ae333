// The hook for the demo's year of history (counter readings, service events and walks), which is
// built on top of the demo content by a later seed. This file gives that seed what it needs and
// does nothing itself: the scenario, the ids of the loaded guides and articles by their stable
// keys, a seeded random source and paths through a guide. See content/README.md.
import type { Knex } from 'knex';
import type { GuideContent, Step } from '../../src/shared/guides/schema';
import { SAMPLE_GUIDE_KEY, Scenario, readContent, type ContentSet } from './content';

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
 * What the history seed implements, e.g. in seeds/03-demo-history.ts:
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
  for (const row of await db('articles').where({ organisation_id: organisationId }).whereIn('slug', set.articles.map((a) => a.key)).select('id', 'slug')) {
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
