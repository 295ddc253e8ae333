// The demo year without a database: the same seed gives the same year, every walk's log is one the
// server would accept and replays to what is stored with it, counters only go up (but for the one
// marked reset), and the scenario's stories show in the numbers.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { readContent, Scenario } from '../../content/lib/content';
import { HISTORY_DAYS, HISTORY_SEED, createRandom, planHistory, walkReplays, type HistoryPlan } from '../../content/lib/history';
import type { GuideContent } from '../../src/shared/guides/schema';
import { DEFAULT_CAUSES } from '../../src/shared/tags';
import { WalkAnswer } from '../../src/shared/walks/answers';
import { canAnswer } from '../../src/shared/walks/walk-path';

const set = readContent();
const scenario = Scenario.parse(set.scenario);
const guides = new Map<string, GuideContent>(set.guides.filter((g) => g.guide).map((g) => [g.key, g.guide!.content]));
const guideCauses = set.guides.flatMap((g) => (g.guide?.guide.causes ?? []).map((c) => c.code));
const causeCodes = [...DEFAULT_CAUSES.map((c) => c.code), ...guideCauses];
const TODAY = new Date('2026-12-02T09:30:00Z');
// The tags seeds/03-demo-assets.ts already gives the demo organisation.
const SKIP = new Set(['V-312', 'V-313', 'V-314', 'A-501', 'A-502', 'W-101', 'W-201', 'W-202']);
const make = (seed = HISTORY_SEED, today = TODAY) => planHistory({ scenario, guides, random: createRandom(seed), today, skipTags: SKIP });
const plan = make();

const hash = (p: HistoryPlan) => createHash('sha256').update(JSON.stringify(p)).digest('hex');
const DAY = 86_400_000;
const dayOf = (iso: string) => Math.round((Date.parse(`${iso.slice(0, 10)}T00:00:00Z`) - Date.parse('2026-12-02T00:00:00Z')) / DAY) + HISTORY_DAYS;
const appOf = new Map(scenario.applicators.map((a) => [String((a as Record<string, unknown>).tag), a as Record<string, unknown> & { line: string; story?: string | null }]));
const story = (key: string) => scenario.stories.find((s) => s.key === key)!.params as Record<string, unknown>;

describe('demo history: determinism and volume', () => {
  it('when planned twice with the fixed seed, then the two years are identical; another seed gives another year', () => {
    expect(hash(make())).toBe(hash(plan));
    expect(hash(make(HISTORY_SEED + 1))).not.toBe(hash(plan));
  });

  it('when planned, then the volumes are those of a plausible year and existing tags are left alone', () => {
    expect(plan.applicators.length).toBe(scenario.applicators.length - 3);
    expect(plan.applicators.map((a) => a.tag)).not.toContain('V-312');
    expect(plan.readings.length).toBeGreaterThan(900);
    expect(plan.readings.length).toBeLessThan(1500);
    expect(plan.services.length).toBeGreaterThanOrEqual(60);
    expect(plan.services.length).toBeLessThanOrEqual(120);
    expect(plan.walks.length).toBeGreaterThanOrEqual(300);
    expect(plan.walks.length).toBeLessThanOrEqual(600);
  });

  it('when planned, then every date lies in the year before today', () => {
    const dates = [...plan.readings.map((r) => r.readOn), ...plan.services.map((s) => s.performedOn), ...plan.walks.flatMap((w) => [w.startedAt, w.endedAt])];
    for (const d of dates) {
      expect(dayOf(d)).toBeGreaterThanOrEqual(0);
      expect(dayOf(d)).toBeLessThanOrEqual(HISTORY_DAYS);
    }
    // Nothing happens later than the start of the day the seed runs, so no walk is in the future.
    for (const w of plan.walks) expect(Date.parse(w.endedAt)).toBeLessThanOrEqual(Date.parse('2026-12-02T00:00:00Z'));
  });
});

describe('demo history: walks', () => {
  it('when each walk log is replayed, then it ends where the walk row says, with its outcome and cause', () => {
    const bad = plan.walks.map((w) => ({ ref: w.ref, problem: walkReplays(guides.get(w.guideKey)!, w) })).filter((x) => x.problem);
    expect(bad).toEqual([]);
  });

  it('when each entry is offered to the server rules one by one, then every one is accepted and well formed', () => {
    for (const w of plan.walks) {
      const content = guides.get(w.guideKey)!;
      const log: WalkAnswer[] = [];
      for (const entry of w.answers) {
        expect(WalkAnswer.safeParse(entry).success).toBe(true);
        const verdict = canAnswer(content, log, entry, { causeCodes });
        if (!verdict.ok) throw new Error(`walk ${w.ref} (${w.guideKey}) entry ${entry.id}: ${verdict.message}`);
        expect(verdict.duplicate).toBe(false);
        log.push(entry);
      }
      // Times move forward through a walk.
      const times = w.answers.map((a) => Date.parse(a.answeredAt));
      expect([...times].sort((a, b) => a - b)).toEqual(times);
      expect(Date.parse(w.startedAt)).toBeLessThanOrEqual(times[0] ?? Infinity);
    }
  });

  it('when a walk ends, then its row fields follow the server rules for that end', () => {
    for (const w of plan.walks) {
      if (w.status === 'abandoned') expect([w.endKind, w.outcome, w.causeCode]).toEqual(['abandoned', null, null]);
      else if (w.endKind === 'handoff') expect([w.outcome, w.causeCode]).toEqual([null, null]);
      else if (w.endKind === 'fixed-by-try') expect([w.outcome, w.causeCode]).toEqual(['fixed', null]);
      else if (w.outcome === 'not-fixed') expect(w.causeCode).toBeNull();
      else expect(w.causeCode).toBeTruthy();
    }
    expect(plan.walks.some((w) => w.outcome === 'fixed-by-other' && w.outcomeNote)).toBe(true);
    expect(plan.walks.some((w) => w.outcome === 'not-fixed')).toBe(true);
    expect(plan.walks.some((w) => w.endKind === 'handoff')).toBe(true);
  });
});

describe('demo history: counters and service records', () => {
  it('when read in order, then each counter only goes up, except at the one reading marked as a reset', () => {
    const byTag = new Map<string, typeof plan.readings>();
    for (const r of plan.readings) byTag.set(r.tag, [...(byTag.get(r.tag) ?? []), r]);
    let resets = 0;
    for (const [tag, readings] of byTag) {
      const sorted = [...readings].sort((a, b) => (a.readOn < b.readOn ? -1 : a.readOn > b.readOn ? 1 : a.ref - b.ref));
      const app = appOf.get(tag)!;
      for (let i = 1; i < sorted.length; i++) {
        const [prev, cur] = [sorted[i - 1], sorted[i]];
        if (cur.counterReset) {
          resets++;
          expect(cur.note).toMatch(/controller replaced/i);
          continue;
        }
        expect(cur.count).toBeGreaterThanOrEqual(prev.count);
        // No faster than the valve's rate around the clock (Line 4 runs more shifts after its change).
        const days = dayOf(cur.readOn) - dayOf(prev.readOn) + 1;
        expect(cur.count - prev.count).toBeLessThanOrEqual(Number(app.cyclesPerMinute) * 60 * 24 * days);
      }
    }
    expect(resets).toBe(1);
  });

  it('when a service record is planned, then its cycle count is its reading and its walk exists', () => {
    const walkRefs = new Set(plan.walks.map((w) => w.ref));
    for (const s of plan.services) {
      const r = plan.readings[s.readingRef];
      expect(r.tag).toBe(s.tag);
      expect(r.readOn).toBe(s.performedOn);
      expect(s.cycleCount).toBe(r.count);
      if (s.walkRef !== null) expect(walkRefs.has(s.walkRef)).toBe(true);
      if (s.actions.includes('other')) expect(s.otherAction).toBeTruthy();
    }
    const walkLinks = plan.services.filter((s) => s.walkRef !== null).map((s) => s.walkRef);
    expect(new Set(walkLinks).size).toBe(walkLinks.length);
  });
});

describe('demo history: the stories', () => {
  it('when Line 4 changes to the filled glue, then its seats need replacing far more often, at about 25 million cycles', () => {
    const p = story('seat-failures-after-fluid-change');
    const change = Number(p.changeAfterDays);
    const seats = plan.services.filter((s) => appOf.get(s.tag)!.line === p.line && s.actions.includes('seat-replaced'));
    const before = seats.filter((s) => dayOf(s.performedOn) < change).length;
    const after = seats.filter((s) => dayOf(s.performedOn) >= change).length;
    expect(after).toBeGreaterThanOrEqual(6);
    expect(after / (HISTORY_DAYS - change)).toBeGreaterThanOrEqual((3 * before) / change);
    // A seat fitted after the change lasts 20-30 million cycles (no counter reset on Line 4).
    const intervals: number[] = [];
    for (const tag of new Set(seats.map((s) => s.tag))) {
      const own = seats.filter((s) => s.tag === tag);
      for (let i = 1; i < own.length; i++) intervals.push(own[i].cycleCount - own[i - 1].cycleCount);
    }
    expect(intervals.length).toBeGreaterThanOrEqual(3);
    for (const n of intervals) (expect(n).toBeGreaterThanOrEqual(18e6), expect(n).toBeLessThanOrEqual(32e6));
    const walks = plan.walks.filter((w) => w.story === 'seat-failures-after-fluid-change');
    expect(walks.length).toBe(after);
    for (const w of walks) expect([w.guideKey, w.endedAtStepId, w.causeCode]).toEqual([p.guide, p.findingStep, p.cause]);
  });

  it('when guns run the high-solids sealant, then their seals weep every few months, far sooner than elsewhere', () => {
    const p = story('fast-seal-wear-on-sealant');
    const sealant = plan.services.filter((s) => appOf.get(s.tag)!.fluidName === p.fluid && s.actions.includes('seals-replaced'));
    expect(sealant.length).toBeGreaterThanOrEqual(5);
    for (const tag of new Set(sealant.map((s) => s.tag))) {
      const own = sealant.filter((s) => s.tag === tag);
      expect(own.length).toBeGreaterThanOrEqual(2);
      for (let i = 1; i < own.length; i++) expect(own[i].cycleCount - own[i - 1].cycleCount).toBeLessThan(Number(p.otherSealLifeCycles) / 3);
    }
    const walks = plan.walks.filter((w) => w.story === 'fast-seal-wear-on-sealant');
    expect(walks.length).toBe(sealant.length);
    for (const w of walks) expect([w.guideKey, w.endedAtStepId, w.causeCode]).toEqual([p.guide, p.findingStep, p.cause]);
  });

  it('when people walk the bead skips guide, then over 40 % of the walks are abandoned at the flow check', () => {
    const p = story('abandoned-flow-check');
    const walks = plan.walks.filter((w) => w.guideKey === p.guide);
    const stopped = walks.filter((w) => w.status === 'abandoned' && w.endedAtStepId === p.step);
    expect(walks.length).toBeGreaterThanOrEqual(30);
    expect(stopped.length / walks.length).toBeGreaterThanOrEqual(0.4);
    expect(stopped.length / walks.length).toBeLessThanOrEqual(0.5);
  });

  it('when Line 2 has placement drift from cold melt, then it is on Monday mornings', () => {
    const p = story('monday-cold-starts');
    const cold = plan.walks.filter((w) => appOf.get(w.tag)!.line === p.line && w.endedAtStepId === p.findingStep);
    expect(cold.length).toBeGreaterThanOrEqual(20);
    for (const w of cold) {
      expect(new Date(w.startedAt).getUTCDay()).toBe(p.weekday);
      expect(new Date(w.startedAt).getUTCHours()).toBeLessThan(9);
    }
  });
});
