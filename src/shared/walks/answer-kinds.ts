// The plain facts about a walk's answer log, without its zod schemas: the walk runner replays the
// log on a phone and needs these, not the validation code that the server runs on every entry.
import type { RoutingAnswer, WalkAnswer } from './answers';

/** Client-made idempotency key: a UUID fits, so does any other short random token. */
export const ANSWER_ID_PATTERN = /^[A-Za-z0-9_-]{8,64}$/;
export const WALK_LIMITS = { note: 2000, calculatorInputs: 20, nameLength: 60 } as const;

export const FINDING_OUTCOMES = ['fixed', 'not-fixed', 'fixed-by-other'] as const;
export type FindingOutcome = (typeof FINDING_OUTCOMES)[number];

export function isRoutingAnswer(answer: WalkAnswer): answer is RoutingAnswer {
  return answer.kind !== 'acknowledge' && answer.kind !== 'back';
}
