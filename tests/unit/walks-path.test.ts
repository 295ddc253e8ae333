// Walk path logic over the sample guide: full paths to each kind of end, readings in other units
// and through a calculator, refused answers, going back, and retries of the same answer.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { SAMPLE_GUIDE } from '@/shared/guides/sample';
import type { GuideContent, MeasureStep } from '@/shared/guides/schema';
import { WalkAnswer as WalkAnswerSchema, type WalkAnswer } from '@/shared/walks/answers';
import { canAnswer, nextStepFor, physicalRangeProblem, previousStepId, replayPath, rewind, type WalkState } from '@/shared/walks/walk-path';

const AT = '2025-03-01T10:00:00Z';
type Draft = { stepId: string } & Record<string, unknown>;

/** A walk as the server sees it: every entry goes through canAnswer before it is stored. */
class Walk {
  readonly log: WalkAnswer[] = [];
  private count = 0;

  constructor(readonly content: GuideContent = SAMPLE_GUIDE) {}

  entry(draft: Draft): WalkAnswer {
    this.count += 1;
    return WalkAnswerSchema.parse({ id: `answer-${String(this.count).padStart(4, '0')}`, answeredAt: AT, ...draft });
  }

  /** Stores an entry that must be accepted; returns the walk after it. */
  give(draft: Draft): WalkState {
    const entry = this.entry(draft);
    const result = canAnswer(this.content, this.log, entry);
    if (!result.ok) throw new Error(`refused: ${result.code}: ${result.message}`);
    this.log.push(entry);
    return result.state;
  }

  /** Acknowledges the cautions of the step the walk is on, then answers it. */
  answer(draft: Draft): WalkState {
    const pending = this.state().unacknowledged;
    if (pending.length > 0) this.give({ stepId: draft.stepId, kind: 'acknowledge', cautionIds: pending });
    return this.give(draft);
  }

  refused(draft: Draft) {
    const result = canAnswer(this.content, this.log, this.entry(draft));
    if (result.ok) throw new Error('expected the answer to be refused');
    return result;
  }

  state(): WalkState {
    return replayPath(this.content, this.log);
  }
}

const pathOf = (state: WalkState) => state.path.map((entry) => entry.stepId);
const choose = (stepId: string, choiceId: string): Draft => ({ stepId, kind: 'choice', choiceId });
const read = (stepId: string, value: number, unit: string, extra: Record<string, unknown> = {}): Draft => ({ stepId, kind: 'reading', value, unit, ...extra });
const tried = (stepId: string, fixed: boolean): Draft => ({ stepId, kind: 'try', fixed });
const coilAt20C = { calculatorInputs: { measuredAt: { value: 20, unit: 'degC' } } };

describe('full paths through the sample guide', () => {
  it('when a new walk starts, then it is at the start step with nothing answered', () => {
    const state = new Walk().state();
    expect(state).toMatchObject({ current: 'drip-when', at: 'drip-when', ended: null, problems: [], unacknowledged: [] });
    expect(pathOf(state)).toEqual(['drip-when']);
  });

  it('when the drop follows every shot and the pressure is high, then the walk ends at the pressure finding', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    const state = walk.answer(read('fluid-pressure', 6.2, 'bar'));
    expect(pathOf(state)).toEqual(['drip-when', 'fluid-pressure', 'finding-pressure-high']);
    expect(state).toMatchObject({ current: null, at: 'finding-pressure-high', ended: 'finding' });
    expect(state.path[1].route).toMatchObject({ bandId: 'high', routedValue: { value: 6.2, unit: 'bar' } });
  });

  it('when the seat is cleaned and that fixes it, then the walk ends at the debris finding with its outcome', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'between-shots'));
    expect(walk.state().unacknowledged).toEqual(['lock-out', 'relieve-pressure', 'solvent']);
    walk.answer(tried('clean-seat', true));
    const state = walk.give({ stepId: 'finding-seat-debris', kind: 'finding-outcome', outcome: 'fixed', note: 'Cleaned seat, changed filter.' });
    expect(pathOf(state)).toEqual(['drip-when', 'clean-seat', 'finding-seat-debris']);
    expect(state.ended).toBe('finding');
    expect(state.outcome).toMatchObject({ outcome: 'fixed' });
  });

  it('when cleaning does not help, the seat looks fine and the driver holds voltage, then the walk ends at the driver finding', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'between-shots'));
    walk.answer(tried('clean-seat', false));
    walk.answer(choose('seat-inspect', 'both-fine'));
    const state = walk.answer(read('off-voltage', 12, 'V'));
    expect(pathOf(state)).toEqual(['drip-when', 'clean-seat', 'seat-inspect', 'off-voltage', 'finding-driver']);
    expect(state.ended).toBe('finding');
  });

  it('when a shorter nozzle fixes a hot-melt drool, then the walk ends fixed at that Try', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-stop'));
    walk.answer(read('nozzle-temp', 360, 'degF'));
    const state = walk.answer(tried('short-nozzle', true));
    expect(pathOf(state)).toEqual(['drip-when', 'nozzle-temp', 'short-nozzle']);
    expect(state).toMatchObject({ current: null, at: 'short-nozzle', ended: 'fixed-by-try' });
  });

  it('when the coil is within tolerance and a new spring does not help, then the walk ends at the hand-off', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    walk.answer(read('fluid-pressure', 4, 'bar'));
    walk.answer(tried('purge-air', false));
    walk.answer(read('off-voltage', 0.3, 'V'));
    walk.answer(read('coil-resistance', 28.1, 'ohm', coilAt20C));
    const state = walk.answer(tried('spring-try', false));
    expect(pathOf(state)).toEqual(['drip-when', 'fluid-pressure', 'purge-air', 'off-voltage', 'coil-resistance', 'spring-try', 'handoff-engineer']);
    expect(state).toMatchObject({ current: null, ended: 'handoff' });
    expect(walk.refused({ stepId: 'handoff-engineer', kind: 'try', fixed: true }).code).toBe('walk-ended');
  });

  it('when random answers are given at every step, then the walk always reaches an end without visiting a step twice', () => {
    const readings: Record<string, [number, string][]> = {
      'fluid-pressure': [
        [3, 'bar'],
        [90, 'psi'],
      ],
      'off-voltage': [
        [-0.2, 'V'],
        [24, 'V'],
      ],
      'coil-resistance': [
        [22, 'ohm'],
        [28.8, 'ohm'],
        [40, 'ohm'],
      ],
      'nozzle-temp': [
        [170, 'degC'],
        [400, 'degF'],
      ],
    };
    fc.assert(
      fc.property(fc.array(fc.nat(), { minLength: 20, maxLength: 20 }), (picks) => {
        const walk = new Walk();
        let state = walk.state();
        for (const pick of picks) {
          const step = SAMPLE_GUIDE.steps.find((s) => s.id === state.current);
          if (!step) break;
          if (step.kind === 'ask') state = walk.answer(choose(step.id, step.choices[pick % step.choices.length].id));
          else if (step.kind === 'try') state = walk.answer(tried(step.id, pick % 2 === 0));
          else if (step.kind === 'measure') {
            const [value, unit] = readings[step.id][pick % readings[step.id].length];
            state = walk.answer(read(step.id, value, unit, step.calculator ? coilAt20C : {}));
          }
        }
        expect(state.ended).not.toBeNull();
        expect(new Set(pathOf(state)).size).toBe(state.path.length);
      }),
      { numRuns: 60 },
    );
  });
});

describe('readings', () => {
  const pressure = SAMPLE_GUIDE.steps.find((s) => s.id === 'fluid-pressure') as MeasureStep;
  const coil = SAMPLE_GUIDE.steps.find((s) => s.id === 'coil-resistance') as MeasureStep;
  const reading = (value: number, unit: string, extra: Record<string, unknown> = {}) =>
    WalkAnswerSchema.parse({ id: 'reading-0001', stepId: 'x', answeredAt: AT, kind: 'reading', value, unit, ...extra }) as Extract<WalkAnswer, { kind: 'reading' }>;

  it('when a pressure is read in psi against bands in bar, then it lands in the band its bar value falls in', () => {
    // 79 psi ≈ 5.447 bar and 80 psi ≈ 5.516 bar, either side of the 5.5 bar limit.
    expect(nextStepFor(pressure, reading(79, 'psi'))).toMatchObject({ ok: true, bandId: 'normal', next: 'purge-air' });
    const high = nextStepFor(pressure, reading(80, 'psi'));
    expect(high).toMatchObject({ ok: true, bandId: 'high' });
    expect(high.ok && high.routedValue?.value).toBeCloseTo(5.51581, 4);
    expect(nextStepFor(pressure, reading(550, 'kPa'))).toMatchObject({ bandId: 'normal' });
  });

  it('when a reading sits exactly on a band limit, then the band that includes the limit is chosen', () => {
    expect(nextStepFor(pressure, reading(5.5, 'bar'))).toMatchObject({ bandId: 'normal' });
  });

  it('when the coil resistance goes through the calculator, then its deviation in % picks the band and is kept as computed', () => {
    // 25 Ω at 20 °C against 28.8 Ω nominal: −13.19 %, more than 10 % low.
    const low = nextStepFor(coil, reading(25, 'ohm', coilAt20C));
    expect(low).toMatchObject({ ok: true, bandId: 'low', next: 'finding-coil-shorted', computed: { unit: '%' } });
    expect(low.ok && low.computed?.value).toBeCloseTo(-13.1944, 3);
    // 26.5 Ω measured warm at 30 °C corrects to 25.5 Ω at 20 °C: −11.5 %, still low.
    expect(nextStepFor(coil, reading(26.5, 'ohm', { calculatorInputs: { measuredAt: { value: 86, unit: 'degF' } } }))).toMatchObject({ bandId: 'low' });
    expect(nextStepFor(coil, reading(28.8, 'ohm', coilAt20C))).toMatchObject({ bandId: 'in-tolerance', next: 'spring-try' });
  });

  it('when the device sends its computed output as a plain fraction, then it is checked in the bands’ % unit', () => {
    const agree = nextStepFor(coil, reading(25, 'ohm', { ...coilAt20C, computed: { value: -0.131944444, unit: '1' } }));
    expect(agree).toMatchObject({ ok: true, bandId: 'low' });
    const disagree = nextStepFor(coil, reading(25, 'ohm', { ...coilAt20C, computed: { value: -0.05, unit: '1' } }));
    expect(disagree).toMatchObject({ ok: false, code: 'computed-mismatch', field: 'computed.value' });
    expect(nextStepFor(coil, reading(25, 'ohm', { ...coilAt20C, computed: { value: 1, unit: 'bar' } }))).toMatchObject({ code: 'computed-unit' });
  });

  it('when the bands are in a plain fraction and the calculator gives %, then the output is converted to the bands’ unit', () => {
    const fraction: MeasureStep = {
      ...coil,
      bandUnit: '1',
      bands: coil.bands.map((band) => ({ ...band, min: band.min === null ? null : band.min / 100, max: band.max === null ? null : band.max / 100 })),
    };
    const result = nextStepFor(fraction, reading(25, 'ohm', coilAt20C));
    expect(result).toMatchObject({ ok: true, bandId: 'low', computed: { unit: '1' } });
    expect(result.ok && result.computed?.value).toBeCloseTo(-0.131944, 5);
  });

  it('when a calculator input is missing, fixed by the guide, or the reading itself, then the answer is refused at that field', () => {
    expect(nextStepFor(coil, reading(25, 'ohm'))).toMatchObject({ ok: false, code: 'calculator-input', field: 'calculatorInputs.measuredAt' });
    expect(nextStepFor(coil, reading(25, 'ohm', { calculatorInputs: { measuredAt: { value: 20, unit: 'degC' }, nominalResistance: { value: 25, unit: 'ohm' } } }))).toMatchObject({
      ok: false,
      code: 'calculator-input-fixed',
      field: 'calculatorInputs.nominalResistance',
    });
    expect(nextStepFor(coil, reading(25, 'ohm', { calculatorInputs: { measuredAt: { value: 20, unit: 'degC' }, measuredResistance: { value: 25, unit: 'ohm' } } }))).toMatchObject({
      ok: false,
      code: 'calculator-input-reading',
    });
  });

  it('when a reading is in a unit of another kind or an unknown unit, then it is refused with the units that fit', () => {
    const wrong = nextStepFor(pressure, reading(3, 'ohm'));
    expect(wrong).toMatchObject({ ok: false, code: 'reading-unit', field: 'unit' });
    expect(!wrong.ok && wrong.message).toBe("'ohm' is a resistance unit; this step needs a pressure: use Pa, kPa, MPa, bar or psi");
    expect(nextStepFor(pressure, reading(3, 'furlong'))).toMatchObject({ ok: false, code: 'reading-unit' });
  });

  it('when a reading is physically impossible, then it is refused; when it is merely negative where that is possible, then it is accepted', () => {
    expect(nextStepFor(coil, reading(-3, 'ohm', coilAt20C))).toMatchObject({ ok: false, code: 'reading-out-of-range', message: 'A resistance reading cannot be negative' });
    const temperature = SAMPLE_GUIDE.steps.find((s) => s.id === 'nozzle-temp') as MeasureStep;
    expect(nextStepFor(temperature, reading(-500, 'degF'))).toMatchObject({ ok: false, code: 'reading-out-of-range' });
    expect(physicalRangeProblem(-300, 'degC', 'temperature')).toBe('A temperature reading cannot be below absolute zero (-273.15 °C)');
    expect(physicalRangeProblem(-2, 'bar', 'pressure')).toBe('A pressure reading cannot be below a full vacuum (-1.01325 bar)');
    expect(physicalRangeProblem(-0.5, 'bar', 'pressure')).toBeUndefined();
    const voltage = SAMPLE_GUIDE.steps.find((s) => s.id === 'off-voltage') as MeasureStep;
    expect(nextStepFor(voltage, reading(-0.4, 'V'))).toMatchObject({ ok: true, bandId: 'released' });
  });
});

describe('answers the walk refuses', () => {
  it('when a step that is not on the path is answered, then it is refused as not on the current path', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    const refused = walk.refused(tried('clean-seat', true));
    expect(refused).toMatchObject({ code: 'not-on-path', stepId: 'clean-seat' });
    expect(refused.message).toBe("Step 'clean-seat' is not on the walk's current path; the walk is at step 'fluid-pressure'");
  });

  it('when an earlier step on the path is answered again without going back, then it is refused', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    expect(walk.refused(choose('drip-when', 'between-shots')).code).toBe('already-answered');
  });

  it('when a step with cautions is answered before they are acknowledged, then it is refused and names them', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'between-shots'));
    const refused = walk.refused(tried('clean-seat', true));
    expect(refused.code).toBe('cautions-unacknowledged');
    expect(refused.message).toContain("'lock-out', 'relieve-pressure', 'solvent'");
    walk.give({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['lock-out', 'relieve-pressure'] });
    expect(walk.refused(tried('clean-seat', true)).message).toContain("'solvent'");
    expect(walk.refused({ stepId: 'clean-seat', kind: 'acknowledge', cautionIds: ['dragons'] }).code).toBe('caution-unknown');
  });

  it('when the answer does not fit the step kind or names an unknown choice, then it is refused', () => {
    const walk = new Walk();
    expect(walk.refused(tried('drip-when', true)).code).toBe('answer-kind');
    expect(walk.refused(choose('drip-when', 'sometimes'))).toMatchObject({ code: 'choice-unknown', field: 'choiceId' });
    expect(walk.refused(choose('no-such-step', 'x')).code).toBe('step-unknown');
  });

  it('when something else fixed the fault, then the outcome needs a note and a cause code from the list', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    walk.answer(read('fluid-pressure', 7, 'bar'));
    expect(walk.refused({ stepId: 'finding-pressure-high', kind: 'finding-outcome', outcome: 'fixed-by-other' }).code).toBe('outcome-note');
    expect(walk.refused({ stepId: 'finding-pressure-high', kind: 'finding-outcome', outcome: 'fixed', causeCode: 'seat-worn' }).code).toBe('outcome-cause');
    const entry = walk.entry({ stepId: 'finding-pressure-high', kind: 'finding-outcome', outcome: 'fixed-by-other', note: 'New seat', causeCode: 'gremlins' });
    expect(canAnswer(SAMPLE_GUIDE, walk.log, entry, { causeCodes: ['seat-worn'] })).toMatchObject({ ok: false, code: 'cause-unknown' });
    const state = walk.give({ stepId: 'finding-pressure-high', kind: 'finding-outcome', outcome: 'fixed-by-other', note: 'New seat', causeCode: 'seat-worn' });
    expect(state.outcome).toMatchObject({ outcome: 'fixed-by-other', causeCode: 'seat-worn' });
  });
});

describe('going back', () => {
  it('when the walk goes back and a different answer is given, then the path changes and the old answers stay in the log', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    walk.answer(read('fluid-pressure', 4, 'bar'));
    expect(walk.state().current).toBe('purge-air');
    expect(previousStepId(walk.state())).toBe('fluid-pressure');

    walk.give({ stepId: 'drip-when', kind: 'back' });
    const back = walk.state();
    expect(back.current).toBe('drip-when');
    expect(pathOf(back)).toEqual(['drip-when']);
    expect(back.previousAnswer).toMatchObject({ kind: 'choice', choiceId: 'after-each-shot' });

    const changed = walk.answer(choose('drip-when', 'between-shots'));
    expect(pathOf(changed)).toEqual(['drip-when', 'clean-seat']);
    expect(walk.log.some((entry) => entry.stepId === 'fluid-pressure' && entry.kind === 'reading')).toBe(true);
  });

  it('when the walk goes back and the same answer is given again, then the later answers come back onto the path', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    walk.answer(read('fluid-pressure', 4, 'bar'));
    walk.give({ stepId: 'drip-when', kind: 'back' });
    walk.answer(choose('drip-when', 'between-shots'));
    walk.give({ stepId: 'drip-when', kind: 'back' });
    const state = walk.answer(choose('drip-when', 'after-each-shot'));
    expect(pathOf(state)).toEqual(['drip-when', 'fluid-pressure', 'purge-air']);
    expect(state.path[1].answer).toMatchObject({ kind: 'reading', value: 4 });
  });

  it('when rewind is used, then it appends a back entry and replay stops at that step', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-stop'));
    walk.answer(read('nozzle-temp', 200, 'degC'));
    expect(walk.state().ended).toBe('finding');
    const log = rewind(walk.log, 'nozzle-temp', { id: 'back-00000001', answeredAt: AT });
    expect(log).toHaveLength(walk.log.length + 1);
    const state = replayPath(SAMPLE_GUIDE, log);
    expect(state).toMatchObject({ current: 'nozzle-temp', ended: null, unacknowledged: [] });
    expect(state.previousAnswer).toMatchObject({ value: 200 });
  });

  it('when going back to a step that is not on the path, then it is refused', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    expect(walk.refused({ stepId: 'clean-seat', kind: 'back' }).code).toBe('not-on-path');
  });
});

describe('retries', () => {
  it('when the same answer arrives twice with the same id, then it is a duplicate and the path is as if it came once', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    const entry = walk.entry(read('fluid-pressure', 4, 'bar'));
    const first = canAnswer(SAMPLE_GUIDE, walk.log, entry);
    expect(first).toMatchObject({ ok: true, duplicate: false });
    walk.log.push(entry);

    const retry = canAnswer(SAMPLE_GUIDE, walk.log, { ...entry, answeredAt: '2025-03-01T10:00:05Z' });
    expect(retry).toMatchObject({ ok: true, duplicate: true });
    // Even if a retry slipped into the log, replay ignores the second copy.
    const once = replayPath(SAMPLE_GUIDE, walk.log);
    expect(replayPath(SAMPLE_GUIDE, [...walk.log, entry])).toEqual(once);
  });

  it('when an id is reused for a different answer, then it is refused', () => {
    const walk = new Walk();
    const entry = walk.entry(choose('drip-when', 'after-each-shot'));
    walk.log.push(entry);
    expect(canAnswer(SAMPLE_GUIDE, walk.log, { ...entry, choiceId: 'between-shots' } as WalkAnswer)).toMatchObject({ ok: false, code: 'answer-id-reused' });
  });

  it('when a stale answer for an earlier step sits in the log under a new id, then replay keeps the latest one', () => {
    const walk = new Walk();
    walk.answer(choose('drip-when', 'after-each-shot'));
    walk.give({ stepId: 'drip-when', kind: 'back' });
    walk.answer(choose('drip-when', 'after-stop'));
    expect(pathOf(walk.state())).toEqual(['drip-when', 'nozzle-temp']);
  });
});
