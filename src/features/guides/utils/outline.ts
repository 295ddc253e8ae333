// Editing operations on a guide draft, kept pure so undo/redo is a list of snapshots: add a child
// or a sibling, change a step's kind, delete, reorder branches, and the outline as a tree.
import { branchesOf, type DraftStep, type GuideDraftContent, type StepKind } from '@/shared/guides';

export type Content = GuideDraftContent;

function uniqueId(prefix: string, taken: Set<string>): string {
  for (let n = 1; ; n++) {
    const id = `${prefix}${n}`;
    if (!taken.has(id)) return id;
  }
}

export function makeStep(kind: StepKind, id: string, title = ''): DraftStep {
  const common = { id, title, cautions: [], photoIds: [], articleIds: [] };
  switch (kind) {
    case 'ask':
      return {
        ...common,
        kind,
        choices: [
          { id: 'c1', label: 'Yes', next: '' },
          { id: 'c2', label: 'No', next: '' },
        ],
      };
    case 'measure':
      return {
        ...common,
        kind,
        reading: { label: '', kind: 'resistance', unit: 'ohm' },
        bandUnit: 'ohm',
        bands: [
          { id: 'b1', label: 'Low', min: null, max: 0, minInclusive: false, maxInclusive: false, next: '' },
          { id: 'b2', label: 'Normal or high', min: 0, max: null, minInclusive: true, maxInclusive: false, next: '' },
        ],
      };
    case 'try':
      return { ...common, kind, action: '', fixedNext: null, notFixedNext: '' };
    case 'finding':
      return { ...common, kind, causeCode: '', cause: '', remedy: [''], parts: [] };
    case 'handoff':
      return { ...common, kind, contact: '', message: '' };
  }
}

export function emptyGuide(symptom: string): Content {
  return { startStepId: 's1', steps: [makeStep('ask', 's1', symptom ? `What do you see? (${symptom})` : '')] };
}

const clone = <T>(x: T): T => structuredClone(x);

export function stepIds(c: Content): Set<string> {
  return new Set(c.steps.map((s) => s.id));
}

/** Points the step's first open branch at `target`, or adds a branch for it. */
function attach(step: DraftStep, target: string): boolean {
  switch (step.kind) {
    case 'ask': {
      const open = step.choices.find((ch) => !ch.next);
      if (open) open.next = target;
      else step.choices.push({ id: uniqueId('c', new Set(step.choices.map((x) => x.id))), label: `Answer ${step.choices.length + 1}`, next: target });
      return true;
    }
    case 'measure': {
      const open = step.bands.find((b) => !b.next);
      if (open) open.next = target;
      else
        step.bands.push({
          id: uniqueId('b', new Set(step.bands.map((x) => x.id))),
          label: `Band ${step.bands.length + 1}`,
          min: null,
          max: null,
          minInclusive: false,
          maxInclusive: false,
          next: target,
        });
      return true;
    }
    case 'try':
      if (!step.notFixedNext) step.notFixedNext = target;
      else if (step.fixedNext === null || step.fixedNext === '') step.fixedNext = target;
      else return false;
      return true;
    default:
      return false;
  }
}

export interface EditResult {
  content: Content;
  selected?: string;
  error?: string;
}

export function addChild(c: Content, parentId: string, kind: StepKind = 'ask'): EditResult {
  const next = clone(c);
  const parent = next.steps.find((s) => s.id === parentId);
  if (!parent) return { content: c, error: 'Choose a step first' };
  if (parent.kind === 'finding' || parent.kind === 'handoff') return { content: c, error: `A ${parent.kind === 'finding' ? 'Finding' : 'Hand-off'} ends the walk: it cannot lead on to another step` };
  const id = uniqueId('s', stepIds(next));
  if (!attach(parent, id)) return { content: c, error: 'Both branches of this Try already lead somewhere' };
  next.steps.push(makeStep(kind, id));
  return { content: next, selected: id };
}

/** A new step not yet reached by any branch; the caller points a branch at it. */
export function addLooseStep(c: Content, kind: StepKind = 'ask'): { content: Content; id: string } {
  const id = uniqueId('s', stepIds(c));
  return { content: { ...c, steps: [...c.steps, makeStep(kind, id)] }, id };
}

export function changeKind(c: Content, stepId: string, kind: StepKind): EditResult {
  const next = clone(c);
  const i = next.steps.findIndex((s) => s.id === stepId);
  if (i < 0) return { content: c };
  const old = next.steps[i];
  if (old.kind === kind) return { content: c };
  const fresh = makeStep(kind, old.id, old.title);
  Object.assign(fresh, { body: old.body, cautions: old.cautions, photoIds: old.photoIds, articleIds: old.articleIds });
  if (!old.body) delete (fresh as { body?: unknown }).body;
  // Keep where the old branches led, in order, so changing a question into a reading loses nothing.
  const targets = branchesOf(old)
    .map((b) => b.next)
    .filter(Boolean);
  if (fresh.kind === 'ask') fresh.choices.forEach((ch, k) => (ch.next = targets[k] ?? ''));
  if (fresh.kind === 'measure') fresh.bands.forEach((b, k) => (b.next = targets[k] ?? ''));
  if (fresh.kind === 'try') fresh.notFixedNext = targets[0] ?? '';
  for (const t of targets.slice(fresh.kind === 'ask' || fresh.kind === 'measure' ? 2 : fresh.kind === 'try' ? 1 : 0)) attach(fresh, t);
  next.steps[i] = fresh;
  return { content: next, selected: stepId };
}

export function deleteStep(c: Content, stepId: string): EditResult {
  const next = clone(c);
  next.steps = next.steps.filter((s) => s.id !== stepId);
  for (const s of next.steps) {
    if (s.kind === 'ask') s.choices.forEach((ch) => ch.next === stepId && (ch.next = ''));
    if (s.kind === 'measure') s.bands.forEach((b) => b.next === stepId && (b.next = ''));
    if (s.kind === 'try') {
      if (s.fixedNext === stepId) s.fixedNext = null;
      if (s.notFixedNext === stepId) s.notFixedNext = '';
    }
  }
  if (next.startStepId === stepId) next.startStepId = next.steps[0]?.id ?? '';
  return { content: next };
}

export function moveBranch(c: Content, parentId: string, index: number, by: -1 | 1): EditResult {
  const next = clone(c);
  const p = next.steps.find((s) => s.id === parentId);
  const list = p?.kind === 'ask' ? p.choices : p?.kind === 'measure' ? p.bands : null;
  if (!list || index + by < 0 || index + by >= list.length) return { content: c };
  const [item] = list.splice(index, 1);
  list.splice(index + by, 0, item as never);
  return { content: next, selected: (item as { next: string }).next || parentId };
}

export function updateStep(c: Content, step: DraftStep): Content {
  return { ...c, steps: c.steps.map((s) => (s.id === step.id ? step : s)) };
}

export interface OutlineRow {
  stepId: string;
  depth: number;
  /** How the walk gets here from the parent row: the choice, band or try branch. */
  via?: string;
  parentId?: string;
  branchIndex?: number;
  /** The step was already shown higher up; this row only points at it. */
  repeat: boolean;
  hasChildren: boolean;
}

/** The outline as the walk sees it: from the start step down each branch; unconnected steps last. */
export function outlineRows(c: Content, collapsed: Set<string>): { rows: OutlineRow[]; unconnected: string[] } {
  const byId = new Map(c.steps.map((s) => [s.id, s]));
  const seen = new Set<string>();
  const rows: OutlineRow[] = [];
  const stack: OutlineRow[] = [];
  if (byId.has(c.startStepId)) stack.push({ stepId: c.startStepId, depth: 0, repeat: false, hasChildren: false });
  while (stack.length) {
    const row = stack.pop()!;
    const step = byId.get(row.stepId);
    if (!step) continue;
    const repeat = seen.has(row.stepId);
    const branches = branchesOf(step);
    rows.push({ ...row, repeat, hasChildren: !repeat && branches.some((b) => b.next) });
    if (repeat) continue;
    seen.add(row.stepId);
    if (collapsed.has(row.stepId)) continue;
    const children: OutlineRow[] = [];
    branches.forEach((b, k) => {
      if (b.next && byId.has(b.next)) children.push({ stepId: b.next, depth: row.depth + 1, via: branchWords(step, k), parentId: step.id, branchIndex: k, repeat: false, hasChildren: false });
    });
    for (let k = children.length - 1; k >= 0; k--) stack.push(children[k]);
  }
  const unconnected = c.steps.filter((s) => !seen.has(s.id) && !collapsedAncestorHides(c, s.id, seen, collapsed)).map((s) => s.id);
  return { rows, unconnected };
}

// A step under a collapsed step is hidden, not unconnected.
function collapsedAncestorHides(c: Content, id: string, seen: Set<string>, collapsed: Set<string>): boolean {
  if (!collapsed.size) return false;
  const parents = new Map<string, string[]>();
  for (const s of c.steps) for (const b of branchesOf(s)) if (b.next) parents.set(b.next, [...(parents.get(b.next) ?? []), s.id]);
  const stack = [id];
  const visited = new Set<string>();
  while (stack.length) {
    const cur = stack.pop()!;
    if (visited.has(cur)) continue;
    visited.add(cur);
    for (const p of parents.get(cur) ?? []) {
      if (collapsed.has(p) && seen.has(p)) return true;
      stack.push(p);
    }
  }
  return false;
}

export function branchWords(step: DraftStep, index: number): string {
  if (step.kind === 'ask') return step.choices[index]?.label || 'answer';
  if (step.kind === 'measure') return step.bands[index]?.label || 'band';
  if (step.kind === 'try') {
    const b = branchesOf(step)[index];
    return b?.kind === 'fixed' ? 'Fixed' : 'Not fixed';
  }
  return '';
}
