// Zod schemas and types for the entries of a walk's answer log: what the runner sends (and
// queues offline), what the server stores once per idempotency key, and what replay reads.
import { z } from 'zod';
import { ANSWER_ID_PATTERN, FINDING_OUTCOMES, WALK_LIMITS } from './answer-kinds';

export { ANSWER_ID_PATTERN, FINDING_OUTCOMES, WALK_LIMITS, isRoutingAnswer, type FindingOutcome } from './answer-kinds';

const base = {
  id: z.string({ error: 'Answer id is required' }).regex(ANSWER_ID_PATTERN, 'Answer id must be 8 to 64 letters, digits, hyphens or underscores'),
  stepId: z.string({ error: 'Step id is required' }).min(1, 'Step id is required').max(40, 'Step id is too long'),
  /** When the technician answered, by the device's clock (the server keeps its own receipt time). */
  answeredAt: z.iso.datetime({ offset: true, error: 'Answer time must be an ISO date and time' }),
};

const Quantity = z.strictObject({
  value: z.number({ error: 'Value must be a finite number' }),
  unit: z.string({ error: 'Unit is required' }).min(1, 'Unit is required').max(20, 'Unit is too long'),
});

export const ChoiceAnswer = z.strictObject({
  ...base,
  kind: z.literal('choice'),
  choiceId: z.string({ error: 'Choice is required' }).min(1, 'Choice is required').max(40, 'Choice id is too long'),
});

export const ReadingAnswer = z.strictObject({
  ...base,
  kind: z.literal('reading'),
  value: z.number({ error: 'Reading must be a finite number' }),
  unit: z.string({ error: 'Reading unit is required' }).min(1, 'Reading unit is required').max(20, 'Reading unit is too long'),
  /** The step calculator's inputs the technician filled in (not the reading, not the fixed ones). */
  calculatorInputs: z
    .record(z.string().max(WALK_LIMITS.nameLength), z.union([Quantity, z.string().max(WALK_LIMITS.nameLength)]), {
      error: 'Calculator inputs must map input names to values',
    })
    .refine((inputs) => Object.keys(inputs).length <= WALK_LIMITS.calculatorInputs, 'Too many calculator inputs')
    .optional(),
  /** The output the device computed, in any unit of its kind; the server recomputes and compares. */
  computed: Quantity.optional(),
});

export const TryAnswer = z.strictObject({
  ...base,
  kind: z.literal('try'),
  fixed: z.boolean({ error: 'Say whether it fixed the fault' }),
});

export const FindingOutcomeAnswer = z.strictObject({
  ...base,
  kind: z.literal('finding-outcome'),
  outcome: z.enum(FINDING_OUTCOMES, { error: `Outcome must be one of ${FINDING_OUTCOMES.join(', ')}` }),
  /** What was done; required when something else fixed it. */
  note: z.string({ error: 'Note must be text' }).max(WALK_LIMITS.note, `Note must be at most ${WALK_LIMITS.note} characters`).optional(),
  /** The cause that was really found, only with 'fixed-by-other'. */
  causeCode: z.string({ error: 'Cause code must be text' }).max(60, 'Cause code is too long').optional(),
});

/** The technician has read these cautions of the step they are on. */
export const AcknowledgeEntry = z.strictObject({
  ...base,
  kind: z.literal('acknowledge'),
  cautionIds: z.array(z.string().min(1).max(40), { error: 'Cautions to acknowledge must be a list of caution ids' }).min(1, 'Acknowledge at least one caution').max(10, 'Too many cautions'),
});

/** "Back": the walk returns to this step; later answers stay in the log. */
export const BackEntry = z.strictObject({
  ...base,
  kind: z.literal('back'),
});

export const WalkAnswer = z.discriminatedUnion('kind', [ChoiceAnswer, ReadingAnswer, TryAnswer, FindingOutcomeAnswer, AcknowledgeEntry, BackEntry], {
  error: 'Answer kind must be one of choice, reading, try, finding-outcome, acknowledge or back',
});

export type ChoiceAnswer = z.infer<typeof ChoiceAnswer>;
export type ReadingAnswer = z.infer<typeof ReadingAnswer>;
export type TryAnswer = z.infer<typeof TryAnswer>;
export type FindingOutcomeAnswer = z.infer<typeof FindingOutcomeAnswer>;
export type AcknowledgeEntry = z.infer<typeof AcknowledgeEntry>;
export type BackEntry = z.infer<typeof BackEntry>;
/** One entry of a walk's answer log. */
export type WalkAnswer = z.infer<typeof WalkAnswer>;
/** The entries that answer a step and so decide where the walk goes next. */
export type RoutingAnswer = ChoiceAnswer | ReadingAnswer | TryAnswer | FindingOutcomeAnswer;
