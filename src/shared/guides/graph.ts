// The branches leaving each step, in one place, so the validator, the editor's map and the walk
// runner agree on what a guide's edges are.
import type { DraftStep } from './schema';

export type BranchKind = 'choice' | 'band' | 'fixed' | 'not-fixed';

export interface Branch {
  kind: BranchKind;
  /** Choice or band id; absent for a Try's two branches. */
  id?: string;
  /** Plain words for messages: `choice 'Yes'`, `the "fixed" branch`. */
  label: string;
  /** Target step id; '' in a draft when the author has not chosen one yet. */
  next: string;
  /** Path of the `next` field relative to the step, e.g. `choices[1].next`. */
  path: string;
}

/** A Try whose "fixed" goes nowhere ends the walk there, so it has only the "not fixed" branch. */
export function branchesOf(step: DraftStep): Branch[] {
  switch (step.kind) {
    case 'ask':
      return step.choices.map((choice, index) => ({
        kind: 'choice',
        id: choice.id,
        label: `choice '${choice.label || choice.id}'`,
        next: choice.next,
        path: `choices[${index}].next`,
      }));
    case 'measure':
      return step.bands.map((band, index) => ({
        kind: 'band',
        id: band.id,
        label: `band '${band.label || band.id}'`,
        next: band.next,
        path: `bands[${index}].next`,
      }));
    case 'try': {
      const branches: Branch[] = [];
      if (step.fixedNext !== null) {
        branches.push({ kind: 'fixed', label: 'the "fixed" branch', next: step.fixedNext, path: 'fixedNext' });
      }
      branches.push({ kind: 'not-fixed', label: 'the "not fixed" branch', next: step.notFixedNext, path: 'notFixedNext' });
      return branches;
    }
    case 'finding':
    case 'handoff':
      return [];
  }
}
