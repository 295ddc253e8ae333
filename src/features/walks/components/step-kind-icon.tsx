// The step-kind icons of the walk screens (same drawings as the editor's, kept with the walk feature).
import type { StepKind } from '@/shared/guides/schema';

const PATHS: Record<StepKind, string> = {
  ask: 'M12 3a9 9 0 100 18 9 9 0 000-18zM9.5 9.5a2.5 2.5 0 015 .5c0 1.7-2.5 2-2.5 3.5M12 17v.5',
  measure: 'M4 17a8 8 0 1116 0M12 17l4-5',
  try: 'M14.5 6.5a4 4 0 00-5.3 5.3L4 17l3 3 5.2-5.2a4 4 0 005.3-5.3l-2.6 2.6-2.3-.7-.7-2.3z',
  finding: 'M12 21s-6-5.5-6-11a6 6 0 0112 0c0 5.5-6 11-6 11zM12 8a2 2 0 100 4 2 2 0 000-4z',
  handoff: 'M5 4h4l2 5-2.5 1.5a11 11 0 005 5L15 13l5 2v4a2 2 0 01-2 2A16 16 0 013 6a2 2 0 012-2z',
};

export function StepKindIcon({ kind }: { kind: StepKind }) {
  return (
    <svg viewBox="0 0 24 24" width="18" height="18" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" aria-hidden>
      <path d={PATHS[kind]} />
    </svg>
  );
}
