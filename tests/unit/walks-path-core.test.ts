// The walk path core that the phone runner uses without the calculators: bound to them it decides
// exactly as walk-path.ts (the server's rules) over the demo guides, and the runner's "does this
// log need the calculators" check is never wrong in the direction that would change a path.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readContent, Scenario } from '../../content/lib/content';
import { HISTORY_SEED, createRandom, planHistory } from '../../content/lib/history';
import type { GuideContent, Step } from '@/shared/guides/schema';
import type { WalkAnswer } from '@/shared/walks/answers';
import * as server from '@/shared/walks/walk-path';
import { STEP_CALCULATORS } from '@/shared/walks/walk-path';
import * as core from '@/shared/walks/walk-path-core';
import { WITHOUT_CALCULATORS, logNeedsCalculators } from '@/shared/walks/walk-path-core';

const set = readContent();
const guides = new Map<string, GuideContent>(set.guides.filter((g) => g.guide).map((g) => [g.key, g.guide!.content]));
const AT = '2026-11-20T08:00:00Z';

/** The calculators as the runner picks them: the real ones only when the log needs them. */
const runnerCalculators = (content: GuideContent, log: readonly WalkAnswer[]) => (logNeedsCalculators(content, log) ? STEP_CALCULATORS : WITHOUT_CALCULATORS);

/** Replays every prefix of a log both ways, and offers each next entry to both rule sets. */
function expectSameDecisions(content: GuideContent, answers: readonly WalkAnswer[]) {
  for (let n = 0; n <= answers.length; n += 1) {
    const log = answers.slice(0, n);
    const expected = server.replayPath(content, log);
    expect(core.replayPath(STEP_CALCULATORS, content, log)).toEqual(expected);
    expect(core.replayPath(runnerCalculators(content, log), content, log)).toEqual(expected);
    if (n < answers.length) {
      const next = answers[n];
      const withNext = [...log, next];
      expect(core.canAnswer(runnerCalculators(content, withNext), content, log, next)).toEqual(server.canAnswer(content, log, next));
    }
  }
}

const measureWithCalculator = (content: GuideContent) => content.steps.filter((s): s is Extract<Step, { kind: 'measure' }> => s.kind === 'measure' && s.calculator !== undefined);

describe('walk path core bound to the calculators', () => {
  it('when the demo year’s walk logs are replayed entry by entry, then the core and the runner’s choice of calculators decide as the server does', () => {
    const scenario = Scenario.parse(set.scenario);
    const plan = planHistory({ scenario, guides, random: createRandom(HISTORY_SEED), today: new Date('2026-12-02T09:30:00Z') });
    const withCalculatorReadings = plan.walks.filter((w) => logNeedsCalculators(guides.get(w.guideKey)!, w.answers));
    // The logs cover both kinds of walk, or this test would prove little.
    expect(withCalculatorReadings.length).toBeGreaterThan(10);
    expect(plan.walks.length - withCalculatorReadings.length).toBeGreaterThan(10);
    for (const walk of plan.walks) expectSameDecisions(guides.get(walk.guideKey)!, walk.answers);
  });

  it('when random walks go through each demo guide, with readings, backs and retries, then the core decides as the server does', () => {
    const keys = [...guides.keys()];
    // Reading values spread over several decades, so bands on each side and refusals all occur.
    const VALUES = [-5, 0, 0.3, 1, 2, 4, 7, 12, 20, 30, 60, 150, 180, 400, 2000, 5e7];
    fc.assert(
      fc.property(fc.nat(), fc.array(fc.nat(), { minLength: 30, maxLength: 30 }), (guidePick, picks) => {
        const content = guides.get(keys[guidePick % keys.length])!;
        const log: WalkAnswer[] = [];
        let count = 0;
        const entry = (draft: Record<string, unknown>) => ({ id: `entry-${String((count += 1)).padStart(4, '0')}`, answeredAt: AT, ...draft }) as WalkAnswer;
        for (const pick of picks) {
          const state = server.replayPath(content, log);
          const step = content.steps.find((s) => s.id === state.at);
          if (!step) break;
          let next: WalkAnswer;
          if (pick % 7 === 0 && log.length > 0)
            next = { ...log[pick % log.length] }; // a retry of a stored entry
          else if (pick % 5 === 0 && state.path.length > 1) next = entry({ kind: 'back', stepId: state.path[pick % (state.path.length - 1)].stepId });
          else if (state.unacknowledged.length) next = entry({ kind: 'acknowledge', stepId: step.id, cautionIds: state.unacknowledged });
          else if (step.kind === 'ask') next = entry({ kind: 'choice', stepId: step.id, choiceId: step.choices[pick % step.choices.length].id });
          else if (step.kind === 'try') next = entry({ kind: 'try', stepId: step.id, fixed: pick % 2 === 0 });
          else if (step.kind === 'measure') next = entry({ kind: 'reading', stepId: step.id, value: VALUES[pick % VALUES.length], unit: step.reading.unit });
          else if (step.kind === 'finding') next = entry({ kind: 'finding-outcome', stepId: step.id, outcome: pick % 2 === 0 ? 'fixed' : 'not-fixed' });
          else break;
          const withNext = [...log, next];
          const verdict = server.canAnswer(content, log, next);
          expect(core.canAnswer(runnerCalculators(content, withNext), content, log, next)).toEqual(verdict);
          if (verdict.ok && !verdict.duplicate) log.push(next);
        }
        expectSameDecisions(content, log);
      }),
      { numRuns: 150 },
    );
  });
});

describe('whether a walk’s log needs the calculators', () => {
  const answer = (draft: Record<string, unknown>, n: number) => ({ id: `answer-${String(n).padStart(4, '0')}`, answeredAt: AT, ...draft }) as WalkAnswer;

  /** Answers the walk the way the server accepts, choosing the first choice, until `stop` says so. */
  function walkUntil(content: GuideContent, stop: (step: Step) => boolean, reading: (step: Extract<Step, { kind: 'measure' }>) => { value: number; unit: string }) {
    const log: WalkAnswer[] = [];
    for (let n = 1; n < 60; n += 1) {
      const state = server.replayPath(content, log);
      const step = content.steps.find((s) => s.id === state.current);
      // Cautions are acknowledged first, so the step is ready for its answer.
      if (!step || (state.unacknowledged.length === 0 && stop(step))) return { log, step };
      const draft = state.unacknowledged.length
        ? { kind: 'acknowledge', stepId: step.id, cautionIds: state.unacknowledged }
        : step.kind === 'ask'
          ? { kind: 'choice', stepId: step.id, choiceId: step.choices[0].id }
          : step.kind === 'try'
            ? { kind: 'try', stepId: step.id, fixed: false }
            : step.kind === 'measure'
              ? { kind: 'reading', stepId: step.id, ...reading(step) }
              : null;
      if (!draft) return { log, step };
      const next = answer(draft, n);
      const verdict = server.canAnswer(content, log, next);
      if (!verdict.ok) throw new Error(`refused at ${step.id}: ${verdict.message}`);
      log.push(next);
    }
    throw new Error('the walk did not stop');
  }

  it('when a guide has no Measure step with a calculator, then even a log full of readings does not need them', () => {
    const plain = [...guides.values()].filter((g) => measureWithCalculator(g).length === 0);
    expect(plain.length).toBeGreaterThan(0);
    for (const content of plain) {
      const measures = content.steps.filter((s) => s.kind === 'measure');
      const log = measures.map((s, n) => answer({ kind: 'reading', stepId: s.id, value: 1, unit: s.kind === 'measure' ? s.reading.unit : '' }, n + 1));
      expect(log.length).toBeGreaterThan(0);
      expect(logNeedsCalculators(content, log)).toBe(false);
      // And replay without them agrees with the server on that log.
      expect(core.replayPath(WITHOUT_CALCULATORS, content, log)).toEqual(server.replayPath(content, log));
    }
  });

  it('when the walk has reached a Measure step with a calculator but not answered it, then the log does not need them; once answered, it does', () => {
    const content = guides.get('coil-running-hot')!;
    const { log, step } = walkUntil(
      content,
      (s) => s.kind === 'measure' && s.calculator !== undefined,
      (s) => ({ value: 20, unit: s.reading.unit }),
    );
    expect(step?.kind === 'measure' && step.calculator).toBeTruthy();
    expect(logNeedsCalculators(content, log)).toBe(false);
    // The runner can show that step without them, as the server would.
    expect(core.replayPath(WITHOUT_CALCULATORS, content, log)).toEqual(server.replayPath(content, log));

    const measure = step as Extract<Step, { kind: 'measure' }>;
    const reading = answer({ kind: 'reading', stepId: measure.id, value: 40, unit: 'ohm' }, 99);
    expect(logNeedsCalculators(content, [...log, reading])).toBe(true);
    // Without them the core refuses to guess rather than route differently from the server.
    expect(() => core.replayPath(WITHOUT_CALCULATORS, content, [...log, reading])).toThrow(/not loaded/);
    expect(() => core.canAnswer(WITHOUT_CALCULATORS, content, log, reading)).toThrow(/not loaded/);
    expect(core.canAnswer(STEP_CALCULATORS, content, log, reading)).toEqual(server.canAnswer(content, log, reading));
    // Going back over that reading leaves it in the log, so the log still needs them.
    const back = answer({ kind: 'back', stepId: measure.id }, 100);
    expect(logNeedsCalculators(content, [...log, reading, back])).toBe(true);
  });

  it('when only the plain Measure steps of a guide with calculators are answered, then the log does not need them', () => {
    const content = guides.get('coil-running-hot')!;
    const withCalculator = new Set(measureWithCalculator(content).map((s) => s.id));
    const plainMeasure = content.steps.find((s) => s.kind === 'measure' && !withCalculator.has(s.id));
    expect(plainMeasure).toBeDefined();
    const log = [answer({ kind: 'reading', stepId: plainMeasure!.id, value: 24, unit: 'V' }, 1)];
    expect(logNeedsCalculators(content, log)).toBe(false);
    expect(logNeedsCalculators(content, [...log, answer({ kind: 'choice', stepId: [...withCalculator][0], choiceId: 'x' }, 2)])).toBe(false);
  });
});
