// The path logic of a walk over a pinned guide version, shared by the runner (which works offline)
// and the server (which checks every answer before storing it), so both always agree. The step
// calculators come in as an argument: walk-path.ts binds the real ones for the server, while the
// phone runner loads them only for a walk that needs them (see logNeedsCalculators).
//
// Rules:
// - A walk keeps its full answer log in arrival order and never rewrites it. Each entry carries a
//   client-made `id` (idempotency key) and `answeredAt`. An entry whose id is already in the log
//   is a retry: replay ignores it, and canAnswer reports it as a duplicate to store nothing.
// - Replay starts at the start step and, at each step, uses the latest answer for that step in the
//   log, unless a later "back" entry for that step took it off the path: then the step is current
//   again, and its earlier answer is offered as `previousAnswer` to prefill the form.
// - Back (rewind) only adds an entry. Answers further along stay in the log: answering the step
//   the same way again brings them straight back onto the path; answering differently sends the
//   walk down another branch and leaves them off it (still stored, for the record).
// - Only the current step can be answered. To change an earlier answer, go back to it first.
// - A step with cautions cannot be answered until each of its cautions has been acknowledged
//   (an 'acknowledge' entry, once per walk and step; going back does not undo it).
// - A Measure reading must be in a unit of the reading's kind and physically possible; it is
//   converted into the bands' unit, or run through the step's calculator whose output (in the
//   bands' unit) picks the band. A device-computed output is checked against the recomputation.
// - The walk ends at a Finding (whose outcome is recorded with a 'finding-outcome' entry), at a
//   Hand-off, or at a Try answered "fixed" that has nowhere to go next.
import { CalculatorInputError, UnknownCalculatorError, type CalculatorResponse } from '../calculators/types';
import { bandFor } from '../guides/bands';
import type { GuideContent, MeasureStep, Step } from '../guides/schema';
import { KIND_LABELS, UnitError, formatNumber, fromSI, isUnitOf, kindOfUnit, kindsOfUnit, toSI, unitLabel, unitList, type QuantityKind } from '../units';
import { isRoutingAnswer } from './answer-kinds';
import type { FindingOutcomeAnswer, ReadingAnswer, RoutingAnswer, WalkAnswer } from './answers';

/** What replay needs of the calculators, for Measure steps that route through one. */
export interface StepCalculators {
  /** Whether a calculator with this id exists. */
  has(id: string): boolean;
  /** Runs it on a request body; throws CalculatorInputError or UnknownCalculatorError like the registry. */
  run(id: string, request: { inputs: Record<string, unknown>; outputUnits: Record<string, string> }): CalculatorResponse;
}

/**
 * For code that has checked with logNeedsCalculators that no calculator will be asked for. Asking
 * anyway throws rather than route the walk differently from the server.
 */
export const WITHOUT_CALCULATORS: StepCalculators = {
  has: notLoaded,
  run: notLoaded,
};

function notLoaded(): never {
  throw new Error('The step calculators are not loaded; check logNeedsCalculators before replaying without them');
}

/** Whether a step routes its reading through a calculator. */
function usesCalculator(step: Step): boolean {
  return step.kind === 'measure' && step.calculator !== undefined;
}

/**
 * True when replaying this log over this guide may run a calculator: some reading in the log
 * answers a Measure step that has one. Otherwise replay, canAnswer and nextStepFor never touch the
 * calculators, and WITHOUT_CALCULATORS gives the same results as the real ones.
 */
export function logNeedsCalculators(content: GuideContent, answers: readonly WalkAnswer[]): boolean {
  const withCalculator = new Set(content.steps.filter(usesCalculator).map((step) => step.id));
  if (withCalculator.size === 0) return false;
  return answers.some((answer) => answer.kind === 'reading' && withCalculator.has(answer.stepId));
}

export type WalkEnd = 'finding' | 'handoff' | 'fixed-by-try';

export interface WalkProblem {
  code: string;
  message: string;
  stepId?: string;
  /** The answer field at fault, e.g. 'unit' or 'calculatorInputs.measuredAt'. */
  field?: string;
  /** Per-field messages, as the calculator runner gives them. */
  fields?: Record<string, string>;
}

export interface Route {
  ok: true;
  /** The next step, or null when the walk ends here. */
  next: string | null;
  end?: WalkEnd;
  choiceId?: string;
  bandId?: string;
  /** The value that picked the band, in the bands' unit: the converted reading or the calculator output. */
  routedValue?: { value: number; unit: string };
  /** The calculator output, when the step has a calculator; kept in the walk record. */
  computed?: { value: number; unit: string };
}

export type RouteResult = Route | ({ ok: false } & WalkProblem);

export interface WalkPathEntry {
  stepId: string;
  /** The answer in effect; absent on the current step and on a Hand-off. */
  answer?: RoutingAnswer;
  route?: Route;
}

export interface WalkState {
  path: WalkPathEntry[];
  /** The step waiting for an answer; null once the walk has ended (or cannot go on). */
  current: string | null;
  /** The step the technician is on: the current step, or the end step. */
  at: string | null;
  ended: WalkEnd | null;
  /** The outcome recorded at a Finding end. */
  outcome?: FindingOutcomeAnswer;
  /** The current step's answer that a back entry took off the path, for prefilling. */
  previousAnswer?: RoutingAnswer;
  /** Cautions of the step the technician is on that are not yet acknowledged. */
  unacknowledged: string[];
  /** Caution ids acknowledged per step over the whole walk. */
  acknowledged: Record<string, string[]>;
  problems: WalkProblem[];
}

function refuse(code: string, message: string, extra: Partial<WalkProblem> = {}): { ok: false } & WalkProblem {
  return { ok: false, code, message, ...extra };
}

const ANSWER_FOR: Record<Step['kind'], string> = {
  ask: 'a choice',
  measure: 'a reading',
  try: 'fixed or not fixed',
  finding: 'an outcome',
  handoff: 'nothing: it ends the walk',
};

type Floor = { si: number; words: 'negative' | 'below absolute zero' | 'below a full vacuum' };

// Readings are gauge pressures on the shop floor, so the floor is a full vacuum at one standard
// atmosphere; quantities that are sizes or amounts cannot go below zero.
const PHYSICAL_FLOOR: Partial<Record<QuantityKind, Floor>> = {
  temperature: { si: 0, words: 'below absolute zero' },
  pressure: { si: -101_325, words: 'below a full vacuum' },
  resistance: { si: 0, words: 'negative' },
  length: { si: 0, words: 'negative' },
  area: { si: 0, words: 'negative' },
  volume: { si: 0, words: 'negative' },
  mass: { si: 0, words: 'negative' },
  time: { si: 0, words: 'negative' },
  viscosity: { si: 0, words: 'negative' },
  consistency: { si: 0, words: 'negative' },
  density: { si: 0, words: 'negative' },
  flowRate: { si: 0, words: 'negative' },
  massRate: { si: 0, words: 'negative' },
  massPerLength: { si: 0, words: 'negative' },
  frequency: { si: 0, words: 'negative' },
  count: { si: 0, words: 'negative' },
  springRate: { si: 0, words: 'negative' },
  speed: { si: 0, words: 'negative' },
  shearRate: { si: 0, words: 'negative' },
  power: { si: 0, words: 'negative' },
};

/** A message when a reading is physically impossible for its kind, else undefined. */
export function physicalRangeProblem(value: number, unit: string, kind: QuantityKind): string | undefined {
  const floor = PHYSICAL_FLOOR[kind];
  if (!floor || toSI(value, unit, kind) >= floor.si) return undefined;
  if (floor.words === 'negative') return `A ${KIND_LABELS[kind]} reading cannot be negative`;
  const limit = `${formatNumber(fromSI(floor.si, unit, kind))} ${unitLabel(unit, kind)}`.trim();
  return `A ${KIND_LABELS[kind]} reading cannot be ${floor.words} (${limit})`;
}

function unitProblem(unit: string, kind: QuantityKind): string | undefined {
  if (isUnitOf(unit, kind)) return undefined;
  const other = kindOfUnit(unit);
  return other
    ? `'${unit}' is a ${KIND_LABELS[other]} unit; this step needs a ${KIND_LABELS[kind]}: use ${unitList(kind)}`
    : `Unknown unit '${unit}': this step needs a ${KIND_LABELS[kind]} in ${unitList(kind)}`;
}

function shown(value: number, unit: string): string {
  return `${formatNumber(value)} ${unitLabel(unit)}`.trim();
}

function closeEnough(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-6 * Math.max(Math.abs(a), Math.abs(b)) + 1e-12;
}

function routeReading(calculators: StepCalculators, step: MeasureStep, answer: ReadingAnswer): RouteResult {
  const kind = step.reading.kind;
  const stepId = step.id;
  if (!Number.isFinite(answer.value)) return refuse('reading-not-number', 'The reading must be a finite number', { stepId, field: 'value' });
  const wrongUnit = unitProblem(answer.unit, kind);
  if (wrongUnit) return refuse('reading-unit', wrongUnit, { stepId, field: 'unit' });
  const outOfRange = physicalRangeProblem(answer.value, answer.unit, kind);
  if (outOfRange) return refuse('reading-out-of-range', outOfRange, { stepId, field: 'value' });

  let routedValue: number;
  let computed: { value: number; unit: string } | undefined;
  const calc = step.calculator;
  if (!calc) {
    if (answer.calculatorInputs !== undefined || answer.computed !== undefined) {
      return refuse('no-calculator', 'This step has no calculator: send the reading alone', { stepId, field: 'calculatorInputs' });
    }
    try {
      routedValue = fromSI(toSI(answer.value, answer.unit, kind), step.bandUnit, kind);
    } catch (error) {
      if (error instanceof UnitError) return refuse('guide-unit', `The guide's band unit does not fit this reading: ${error.message}`, { stepId });
      throw error;
    }
  } else {
    if (!calculators.has(calc.id)) return refuse('calculator-unknown', `The guide names a calculator '${calc.id}' that does not exist`, { stepId });
    const inputs: Record<string, unknown> = { ...calc.fixedInputs };
    for (const [name, value] of Object.entries(answer.calculatorInputs ?? {})) {
      const field = `calculatorInputs.${name}`;
      if (Object.prototype.hasOwnProperty.call(calc.fixedInputs, name)) {
        return refuse('calculator-input-fixed', `Input '${name}' is fixed by the guide and cannot be changed on a walk`, { stepId, field });
      }
      if (name === calc.readingInput) {
        return refuse('calculator-input-reading', `Input '${name}' comes from the reading itself`, { stepId, field });
      }
      inputs[name] = value;
    }
    if (calc.readingInput) inputs[calc.readingInput] = { value: answer.value, unit: answer.unit };
    let outputs: Record<string, { value: number; unit: string } | string>;
    try {
      outputs = calculators.run(calc.id, { inputs, outputUnits: { [calc.output]: step.bandUnit } }).outputs;
    } catch (error) {
      if (error instanceof CalculatorInputError) {
        // Field keys come back as `inputs.x`; the answer carries them as calculatorInputs.x or the reading.
        const fields: Record<string, string> = {};
        for (const [key, message] of Object.entries(error.fields)) {
          const name = key.replace(/^inputs\./, '');
          fields[name === calc.readingInput ? 'value' : key.startsWith('inputs.') ? `calculatorInputs.${name}` : key] = message;
        }
        const [field, message] = Object.entries(fields)[0] ?? ['', error.message];
        return refuse('calculator-input', message, { stepId, field, fields });
      }
      if (error instanceof UnknownCalculatorError) return refuse('calculator-unknown', error.message, { stepId });
      throw error;
    }
    const output = outputs[calc.output];
    if (output === undefined || typeof output === 'string') {
      return refuse('calculator-no-output', `The calculator gives no value for '${calc.output}' with these inputs`, { stepId });
    }
    routedValue = output.value;
    computed = { value: output.value, unit: step.bandUnit };
    if (answer.computed) {
      const claimed = answer.computed;
      const sharedKind = kindsOfUnit(step.bandUnit).find((k) => isUnitOf(claimed.unit, k));
      if (!sharedKind) {
        return refuse('computed-unit', `The computed value's unit '${claimed.unit}' does not fit the bands' unit '${step.bandUnit}'`, {
          stepId,
          field: 'computed.unit',
        });
      }
      const claimedInBandUnit = fromSI(toSI(claimed.value, claimed.unit, sharedKind), step.bandUnit, sharedKind);
      if (!closeEnough(claimedInBandUnit, routedValue)) {
        return refuse('computed-mismatch', `The computed value ${shown(claimed.value, claimed.unit)} does not match the calculator's ${shown(routedValue, step.bandUnit)} for these inputs`, {
          stepId,
          field: 'computed.value',
        });
      }
    }
  }

  const band = bandFor(step.bands, routedValue);
  if (!band) {
    return refuse('no-band', `The value ${shown(routedValue, step.bandUnit)} falls in no band of this step`, { stepId });
  }
  return { ok: true, next: band.next, bandId: band.id, routedValue: { value: routedValue, unit: step.bandUnit }, ...(computed ? { computed } : {}) };
}

/** Where an answer leads from a step, or why the answer does not fit the step. */
export function nextStepFor(calculators: StepCalculators, step: Step, answer: RoutingAnswer): RouteResult {
  const stepId = step.id;
  const mismatch = () => refuse('answer-kind', `Step '${step.id}' takes ${ANSWER_FOR[step.kind]}, not a '${answer.kind}' answer`, { stepId });
  switch (answer.kind) {
    case 'choice': {
      if (step.kind !== 'ask') return mismatch();
      const choice = step.choices.find((c) => c.id === answer.choiceId);
      if (!choice) return refuse('choice-unknown', `Step '${step.id}' has no choice '${answer.choiceId}'`, { stepId, field: 'choiceId' });
      return { ok: true, next: choice.next, choiceId: choice.id };
    }
    case 'reading':
      return step.kind === 'measure' ? routeReading(calculators, step, answer) : mismatch();
    case 'try':
      if (step.kind !== 'try') return mismatch();
      if (!answer.fixed) return { ok: true, next: step.notFixedNext };
      return step.fixedNext === null ? { ok: true, next: null, end: 'fixed-by-try' } : { ok: true, next: step.fixedNext };
    case 'finding-outcome':
      if (step.kind !== 'finding') return mismatch();
      if (answer.outcome === 'fixed-by-other') {
        if (!answer.note?.trim()) return refuse('outcome-note', 'Say what fixed it in the note', { stepId, field: 'note' });
        if (!answer.causeCode?.trim()) return refuse('outcome-cause', 'Choose the cause that was really found', { stepId, field: 'causeCode' });
      } else if (answer.causeCode !== undefined) {
        return refuse('outcome-cause', "A cause code goes with 'fixed by something else' only", { stepId, field: 'causeCode' });
      }
      return { ok: true, next: null, end: 'finding' };
  }
}

interface LogIndex {
  entries: WalkAnswer[];
  /** Position and entry of the latest routing answer per step. */
  latest: Map<string, { at: number; answer: RoutingAnswer }>;
  lastBack: Map<string, number>;
  acknowledged: Map<string, Set<string>>;
}

function indexLog(answers: readonly WalkAnswer[]): LogIndex {
  const ids = new Set<string>();
  const entries: WalkAnswer[] = [];
  for (const answer of answers) {
    if (ids.has(answer.id)) continue;
    ids.add(answer.id);
    entries.push(answer);
  }
  const latest = new Map<string, { at: number; answer: RoutingAnswer }>();
  const lastBack = new Map<string, number>();
  const acknowledged = new Map<string, Set<string>>();
  entries.forEach((entry, at) => {
    if (entry.kind === 'back') lastBack.set(entry.stepId, at);
    else if (entry.kind === 'acknowledge') {
      const set = acknowledged.get(entry.stepId) ?? new Set<string>();
      for (const id of entry.cautionIds) set.add(id);
      acknowledged.set(entry.stepId, set);
    } else if (isRoutingAnswer(entry)) latest.set(entry.stepId, { at, answer: entry });
  });
  return { entries, latest, lastBack, acknowledged };
}

/** Rebuilds where a walk stands from its answer log; see the rules at the top of this module. */
export function replayPath(calculators: StepCalculators, content: GuideContent, answers: readonly WalkAnswer[]): WalkState {
  const log = indexLog(answers);
  const byId = new Map(content.steps.map((step) => [step.id, step]));
  const state: WalkState = {
    path: [],
    current: null,
    at: null,
    ended: null,
    unacknowledged: [],
    acknowledged: Object.fromEntries([...log.acknowledged].map(([stepId, ids]) => [stepId, [...ids]])),
    problems: [],
  };

  const visited = new Set<string>();
  let stepId: string | null = content.startStepId;
  while (stepId !== null) {
    const step = byId.get(stepId);
    if (!step) {
      state.problems.push({ code: 'step-missing', message: `The guide has no step '${stepId}'`, stepId });
      break;
    }
    // Published versions have no loops; this only guards against a broken pinned version.
    if (visited.has(stepId)) {
      state.problems.push({ code: 'cycle', message: `The guide loops back to step '${stepId}'`, stepId });
      break;
    }
    visited.add(stepId);
    state.at = stepId;

    const found = log.latest.get(stepId);
    const inEffect = found && found.at > (log.lastBack.get(stepId) ?? -1) ? found.answer : undefined;

    if (step.kind === 'handoff') {
      state.path.push({ stepId });
      state.ended = 'handoff';
      break;
    }
    if (step.kind === 'finding') {
      const outcome = inEffect?.kind === 'finding-outcome' ? inEffect : undefined;
      state.path.push(outcome ? { stepId, answer: outcome } : { stepId });
      state.ended = 'finding';
      if (outcome) state.outcome = outcome;
      else if (found?.answer.kind === 'finding-outcome') state.previousAnswer = found.answer;
      break;
    }
    if (!inEffect) {
      state.path.push({ stepId });
      state.current = stepId;
      if (found) state.previousAnswer = found.answer;
      break;
    }
    const route = nextStepFor(calculators, step, inEffect);
    if (!route.ok) {
      const { ok: _ok, ...problem } = route;
      state.problems.push({ ...problem, stepId });
      state.path.push({ stepId });
      state.current = stepId;
      state.previousAnswer = inEffect;
      break;
    }
    state.path.push({ stepId, answer: inEffect, route });
    if (route.next === null) {
      state.ended = route.end ?? 'fixed-by-try';
      break;
    }
    stepId = route.next;
  }

  const atStep = state.at ? byId.get(state.at) : undefined;
  if (atStep) {
    const done = log.acknowledged.get(atStep.id);
    state.unacknowledged = atStep.cautions.map((caution) => caution.id).filter((id) => !done?.has(id));
  }
  return state;
}

export type CanAnswerResult = { ok: true; duplicate: boolean; route?: Route; state: WalkState } | ({ ok: false } & WalkProblem);

export interface CanAnswerOptions {
  /** The organisation's cause codes, for a 'fixed by something else' outcome. */
  causeCodes?: readonly string[];
}

// A retry must be the same answer; the device clock may be re-serialised, so time is not compared.
function sameEntry(a: WalkAnswer, b: WalkAnswer): boolean {
  const strip = ({ answeredAt: _at, ...rest }: WalkAnswer) => rest;
  return stableJson(strip(a)) === stableJson(strip(b));
}

function stableJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableJson).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${stableJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/**
 * Decides whether a new log entry may be stored. A retry of a stored entry (same id, same answer)
 * is accepted as a duplicate, which the server must not store again; the same id with a different
 * answer is refused. On success `state` is the walk after the entry.
 */
export function canAnswer(calculators: StepCalculators, content: GuideContent, answers: readonly WalkAnswer[], newAnswer: WalkAnswer, options: CanAnswerOptions = {}): CanAnswerResult {
  const stored = answers.find((answer) => answer.id === newAnswer.id);
  if (stored) {
    if (!sameEntry(stored, newAnswer)) {
      return refuse('answer-id-reused', `Answer id '${newAnswer.id}' was already used for a different answer`, { field: 'id' });
    }
    return { ok: true, duplicate: true, state: replayPath(calculators, content, answers) };
  }

  const stepId = newAnswer.stepId;
  const step = content.steps.find((s) => s.id === stepId);
  if (!step) return refuse('step-unknown', `The guide has no step '${stepId}'`, { stepId, field: 'stepId' });
  const state = replayPath(calculators, content, answers);
  const onPath = state.path.some((entry) => entry.stepId === stepId);
  const where = state.at ? `the walk is at step '${state.at}'` : 'the walk has not started';
  const notOnPath = () => refuse('not-on-path', `Step '${stepId}' is not on the walk's current path; ${where}`, { stepId, field: 'stepId' });
  const after = (route?: Route): CanAnswerResult => ({
    ok: true,
    duplicate: false,
    ...(route ? { route } : {}),
    state: replayPath(calculators, content, [...answers, newAnswer]),
  });

  if (newAnswer.kind === 'back') return onPath ? after() : notOnPath();

  if (stepId !== state.at) {
    if (!onPath) return notOnPath();
    if (newAnswer.kind === 'acknowledge') {
      return refuse('not-current', `Acknowledge cautions on the step you are on; ${where}`, { stepId, field: 'stepId' });
    }
    return refuse('already-answered', `Step '${stepId}' is already answered; go back to it to change the answer`, { stepId, field: 'stepId' });
  }

  if (newAnswer.kind === 'acknowledge') {
    const known = new Set(step.cautions.map((caution) => caution.id));
    const unknown = newAnswer.cautionIds.filter((id) => !known.has(id));
    if (unknown.length > 0) {
      return refuse('caution-unknown', `Step '${stepId}' has no caution ${unknown.map((id) => `'${id}'`).join(', ')}`, { stepId, field: 'cautionIds' });
    }
    return after();
  }

  if (state.current === null && step.kind !== 'finding') {
    return refuse('walk-ended', `The walk has ended at step '${stepId}'; go back to change an answer`, { stepId, field: 'stepId' });
  }
  if (state.unacknowledged.length > 0) {
    return refuse('cautions-unacknowledged', `Acknowledge the cautions of step '${stepId}' before answering: ${state.unacknowledged.map((id) => `'${id}'`).join(', ')}`, { stepId });
  }
  if (newAnswer.kind === 'finding-outcome' && newAnswer.causeCode && options.causeCodes && !options.causeCodes.includes(newAnswer.causeCode)) {
    return refuse('cause-unknown', `Cause code '${newAnswer.causeCode}' is not in the organisation's list of causes`, { stepId, field: 'causeCode' });
  }
  const route = nextStepFor(calculators, step, newAnswer);
  if (!route.ok) {
    const { ok: _ok, ...problem } = route;
    return { ok: false, ...problem };
  }
  return after(route);
}

export interface RewindEntry {
  /** Idempotency key of the back entry. */
  id: string;
  answeredAt: string;
}

/**
 * "Back" to a step on the path: appends a back entry, so the step becomes current again while the
 * later answers stay stored. Check it with canAnswer first when the log comes from a client.
 */
export function rewind(answers: readonly WalkAnswer[], toStepId: string, entry: RewindEntry): WalkAnswer[] {
  return [...answers, { id: entry.id, stepId: toStepId, answeredAt: entry.answeredAt, kind: 'back' }];
}

/** The step before the one the technician is on, for the runner's Back button. */
export function previousStepId(state: WalkState): string | null {
  return state.path.length >= 2 ? state.path[state.path.length - 2].stepId : null;
}
