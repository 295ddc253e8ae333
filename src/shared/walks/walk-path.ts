// The walk path logic with every calculator bound: what the server, the tests and the runner's
// calculator form use. The rules themselves live in walk-path-core.ts, which takes the
// calculators as an argument so the phone runner can load them only for walks that need them.
import { getCalculator, runCalculator } from '../calculators';
import type { GuideContent, Step } from '../guides/schema';
import type { WalkAnswer, RoutingAnswer } from './answers';
import * as core from './walk-path-core';

export {
  physicalRangeProblem,
  previousStepId,
  rewind,
  type CanAnswerOptions,
  type CanAnswerResult,
  type RewindEntry,
  type Route,
  type RouteResult,
  type WalkEnd,
  type WalkPathEntry,
  type WalkProblem,
  type WalkState,
} from './walk-path-core';

/** The calculator registry, as the path logic asks for it. */
export const STEP_CALCULATORS: core.StepCalculators = {
  has: (id) => getCalculator(id) !== undefined,
  run: (id, request) => runCalculator(id, request),
};

/** Where an answer leads from a step, or why the answer does not fit the step. */
export function nextStepFor(step: Step, answer: RoutingAnswer): core.RouteResult {
  return core.nextStepFor(STEP_CALCULATORS, step, answer);
}

/** Rebuilds where a walk stands from its answer log; see the rules in walk-path-core.ts. */
export function replayPath(content: GuideContent, answers: readonly WalkAnswer[]): core.WalkState {
  return core.replayPath(STEP_CALCULATORS, content, answers);
}

/**
 * Decides whether a new log entry may be stored. A retry of a stored entry (same id, same answer)
 * is accepted as a duplicate, which the server must not store again; the same id with a different
 * answer is refused. On success `state` is the walk after the entry.
 */
export function canAnswer(content: GuideContent, answers: readonly WalkAnswer[], newAnswer: WalkAnswer, options: core.CanAnswerOptions = {}): core.CanAnswerResult {
  return core.canAnswer(STEP_CALCULATORS, content, answers, newAnswer, options);
}
