// The step kinds and their names in the UI, without the guide schemas: the walk runner on a phone
// needs these words but not the validation code behind them.

export const STEP_KINDS = ['ask', 'measure', 'try', 'finding', 'handoff'] as const;
export type StepKind = (typeof STEP_KINDS)[number];
/** Finding and Hand-off end a walk; the others route on. */
export const END_STEP_KINDS: readonly StepKind[] = ['finding', 'handoff'];

export const STEP_KIND_LABELS: Record<StepKind, string> = {
  ask: 'Ask',
  measure: 'Measure',
  try: 'Try',
  finding: 'Finding',
  handoff: 'Hand-off',
};

/** True for the kinds that end a walk. */
export function isEndStep(step: { kind: StepKind }): boolean {
  return END_STEP_KINDS.includes(step.kind);
}
