// The path a walk has taken: each step with the answer given, in plain words.
import { STEP_KIND_LABELS } from '@/shared/guides/labels';
import type { Step } from '@/shared/guides/schema';
import type { WalkState } from '@/shared/walks/walk-path-core';
import { unitLabel } from '@/shared/units';

function answerWords(step: Step, entry: WalkState['path'][number]): string {
  const a = entry.answer;
  if (!a) return '';
  if (a.kind === 'choice' && step.kind === 'ask') return step.choices.find((c) => c.id === a.choiceId)?.label ?? a.choiceId;
  if (a.kind === 'reading') {
    const band = step.kind === 'measure' ? step.bands.find((b) => b.id === entry.route?.bandId)?.label : undefined;
    return `${a.value} ${unitLabel(a.unit)}${band ? ` → ${band}` : ''}`;
  }
  if (a.kind === 'try') return a.fixed ? 'Fixed' : 'Not fixed';
  if (a.kind === 'finding-outcome') return a.outcome === 'fixed' ? 'Fixed' : a.outcome === 'not-fixed' ? 'Not fixed' : 'Fixed by something else';
  return '';
}

export function WalkPath({ steps, state }: { steps: Step[]; state: WalkState }) {
  return (
    <ol className="mt-2 space-y-2" aria-label="Path">
      {state.path.map((e, i) => {
        const s = steps.find((x) => x.id === e.stepId);
        if (!s) return null;
        return (
          <li key={`${e.stepId}-${i}`} data-path-step={e.stepId} className="rounded-md border border-rule bg-paper-raised p-2">
            <p className="text-xs font-semibold text-ink-soft">
              {i + 1}. {STEP_KIND_LABELS[s.kind]}
            </p>
            <p>{s.title}</p>
            {e.answer ? <p className="font-semibold">{answerWords(s, e)}</p> : <p className="text-sm text-ink-soft">{state.current === e.stepId ? 'waiting for an answer' : ''}</p>}
          </li>
        );
      })}
    </ol>
  );
}
