// What changed between two versions of a guide, matched by step id so the outline can mark each
// step as added, removed or changed and say which of its fields differ.
import { isDeepStrictEqual } from 'node:util';
import type { DraftStep } from '../../../src/shared/guides/schema';
import type { GuideComparison, StepChange } from '../../../src/shared/schemas/guides';
import type { VersionRow } from './guides.repository';

// The body's html is derived from its doc, so only the doc counts as a change.
function fieldValue(step: DraftStep, key: string): unknown {
  if (key === 'body') return step.body?.doc;
  return (step as unknown as Record<string, unknown>)[key];
}

function changedFields(a: DraftStep, b: DraftStep): string[] {
  const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
  keys.delete('id');
  const fields: string[] = [];
  // 'kind' first: when it changes, the rest of the list follows from it.
  if (a.kind !== b.kind) fields.push('kind');
  keys.delete('kind');
  for (const key of keys) if (!isDeepStrictEqual(fieldValue(a, key), fieldValue(b, key))) fields.push(key);
  return fields;
}

const brief = (s: DraftStep): StepChange => ({ id: s.id, kind: s.kind, title: s.title });

export function compareVersions(from: VersionRow, to: VersionRow): GuideComparison {
  const meta: GuideComparison['meta'] = {};
  for (const key of ['title', 'symptom', 'summary'] as const) {
    if (from[key] !== to[key]) meta[key] = { from: from[key], to: to[key] };
  }
  const added = to.tags.filter((t) => !from.tags.includes(t));
  const removed = from.tags.filter((t) => !to.tags.includes(t));
  if (added.length || removed.length) meta.tags = { added, removed };

  const before = new Map(from.content.steps.map((s) => [s.id, s]));
  const after = new Map(to.content.steps.map((s) => [s.id, s]));
  const steps: GuideComparison['steps'] = { added: [], removed: [], changed: [], unchanged: 0 };
  for (const step of to.content.steps) {
    const old = before.get(step.id);
    if (!old) {
      steps.added.push(brief(step));
      continue;
    }
    const fields = changedFields(old, step);
    if (fields.length) steps.changed.push({ ...brief(step), fields });
    else steps.unchanged++;
  }
  for (const step of from.content.steps) if (!after.has(step.id)) steps.removed.push(brief(step));

  return {
    from: { number: from.number, state: from.state },
    to: { number: to.number, state: to.state },
    meta,
    ...(from.content.startStepId !== to.content.startStepId ? { startStepId: { from: from.content.startStepId, to: to.content.startStepId } } : {}),
    steps,
  };
}
