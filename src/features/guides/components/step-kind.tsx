// Step kinds always carry a word and an icon, never colour alone: Ask (question mark),
// Measure (gauge), Try (wrench), Finding (pin), Hand-off (phone).
import type { SVGProps } from 'react';
import { STEP_KIND_LABELS, type StepKind } from '@/shared/guides';

function Svg(props: SVGProps<SVGSVGElement>) {
  return <svg viewBox="0 0 24 24" width="18" height="18" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" aria-hidden {...props} />;
}

export const KIND_ICONS: Record<StepKind, (p: SVGProps<SVGSVGElement>) => React.JSX.Element> = {
  ask: (p) => (
    <Svg {...p}>
      <circle cx="12" cy="12" r="9" />
      <path d="M9.5 9.5a2.5 2.5 0 015 .5c0 1.7-2.5 2-2.5 3.5M12 17v.5" />
    </Svg>
  ),
  measure: (p) => (
    <Svg {...p}>
      <path d="M4 17a8 8 0 1116 0" />
      <path d="M12 17l4-5" />
      <circle cx="12" cy="17" r="1.2" fill="currentColor" />
    </Svg>
  ),
  try: (p) => (
    <Svg {...p}>
      <path d="M14.5 6.5a4 4 0 00-5.3 5.3L4 17l3 3 5.2-5.2a4 4 0 005.3-5.3l-2.6 2.6-2.3-.7-.7-2.3z" />
    </Svg>
  ),
  finding: (p) => (
    <Svg {...p}>
      <path d="M12 21s-6-5.5-6-11a6 6 0 0112 0c0 5.5-6 11-6 11z" />
      <circle cx="12" cy="10" r="2.2" />
    </Svg>
  ),
  handoff: (p) => (
    <Svg {...p}>
      <path d="M5 4h4l2 5-2.5 1.5a11 11 0 005 5L15 13l5 2v4a2 2 0 01-2 2A16 16 0 013 6a2 2 0 012-2z" />
    </Svg>
  ),
};

export const KIND_KEYS: Record<string, StepKind> = { a: 'ask', m: 'measure', t: 'try', f: 'finding', h: 'handoff' };

export function StepKindBadge({ kind, compact = false }: { kind: StepKind; compact?: boolean }) {
  const I = KIND_ICONS[kind];
  const ends = kind === 'finding' || kind === 'handoff';
  return (
    <span
      className={`inline-flex shrink-0 items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold ${ends ? 'border-ink-soft bg-paper-sunk text-ink' : 'border-rule-strong bg-paper-raised text-ink-soft'}`}
    >
      <I />
      {compact ? <span className="sr-only">{STEP_KIND_LABELS[kind]}</span> : STEP_KIND_LABELS[kind]}
    </span>
  );
}
