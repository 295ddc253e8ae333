// The outline: the guide as an indented list, driven from the keyboard. Enter adds a sibling,
// Tab a child, A/M/T/F/H set the kind, arrows move, Alt+arrows reorder, Delete removes.
import { useMemo, useRef, useState, type KeyboardEvent } from 'react';
import type { DraftStep, GuideProblem } from '@/shared/guides';
import { KIND_KEYS, StepKindBadge } from './step-kind';
import { outlineRows, type Content, type OutlineRow } from '../utils/outline';

export interface OutlineActions {
  select: (id: string) => void;
  addChild: (parentId: string) => void;
  addSibling: (parentId: string | undefined) => void;
  setKind: (id: string, kind: DraftStep['kind']) => void;
  remove: (id: string) => void;
  move: (parentId: string, index: number, by: -1 | 1) => void;
}

export function GuideOutline({
  content,
  selected,
  problems,
  flags,
  changes,
  actions,
}: {
  content: Content;
  selected: string | null;
  problems: GuideProblem[];
  flags: Record<string, number>;
  /** Steps added or changed since the published version, when the author asks to see them. */
  changes?: Map<string, 'added' | 'changed'>;
  actions: OutlineActions;
}) {
  const [collapsed, setCollapsed] = useState<Set<string>>(new Set());
  const [filter, setFilter] = useState('');
  const { rows, unconnected } = useMemo(() => outlineRows(content, collapsed), [content, collapsed]);
  const byId = useMemo(() => new Map(content.steps.map((s) => [s.id, s])), [content]);
  const problemCount = useMemo(() => {
    const m = new Map<string, number>();
    for (const p of problems) if (p.stepId) m.set(p.stepId, (m.get(p.stepId) ?? 0) + 1);
    return m;
  }, [problems]);
  const list = useRef<HTMLUListElement>(null);
  const f = filter.trim().toLowerCase();
  const matches = (s: DraftStep | undefined) => !f || (s?.title ?? '').toLowerCase().includes(f) || (s?.id ?? '').includes(f);
  type Row = OutlineRow & { unconnected?: boolean };
  const allRows: Row[] = [...rows, ...unconnected.map((id) => ({ stepId: id, depth: 0, repeat: false, hasChildren: false, unconnected: true }))];

  function focusRow(index: number) {
    const items = list.current?.querySelectorAll<HTMLElement>('[data-row]');
    items?.[Math.max(0, Math.min(index, items.length - 1))]?.focus();
  }

  function onKey(e: KeyboardEvent, index: number) {
    const row = allRows[index];
    const k = e.key.toLowerCase();
    if (e.key === 'ArrowDown' && !e.altKey) return (e.preventDefault(), focusRow(index + 1));
    if (e.key === 'ArrowUp' && !e.altKey) return (e.preventDefault(), focusRow(index - 1));
    if ((e.key === 'ArrowUp' || e.key === 'ArrowDown') && e.altKey && row.parentId !== undefined && row.branchIndex !== undefined) {
      e.preventDefault();
      return actions.move(row.parentId, row.branchIndex, e.key === 'ArrowUp' ? -1 : 1);
    }
    if (e.key === 'ArrowLeft') return (e.preventDefault(), setCollapsed((c) => new Set(c).add(row.stepId)));
    if (e.key === 'ArrowRight')
      return (
        e.preventDefault(),
        setCollapsed((c) => {
          const n = new Set(c);
          n.delete(row.stepId);
          return n;
        })
      );
    if (e.key === 'Tab' && !e.shiftKey) return (e.preventDefault(), actions.addChild(row.stepId));
    if (e.key === 'Enter') return (e.preventDefault(), actions.addSibling(row.parentId));
    if (e.key === 'Delete' || e.key === 'Backspace') {
      e.preventDefault();
      if (window.confirm('Delete this step? Branches that led to it will need a new target.')) actions.remove(row.stepId);
      return;
    }
    if (!e.ctrlKey && !e.metaKey && !e.altKey && KIND_KEYS[k]) return (e.preventDefault(), actions.setKind(row.stepId, KIND_KEYS[k]));
  }

  return (
    <div>
      <label className="mb-2 block">
        <span className="sr-only">Find a step</span>
        <input
          type="search"
          value={filter}
          onChange={(e) => setFilter(e.target.value)}
          placeholder="Find a step…"
          className="min-h-11 w-full rounded-md border border-rule-strong bg-paper-raised px-3"
        />
      </label>
      <p id="outline-keys" className="mb-2 text-xs text-ink-soft">
        Keys: Tab adds a next step, Enter adds a step beside it, A M T F H set Ask, Measure, Try, Finding, Hand-off; Alt+↑↓ reorder; ←→ fold; Delete removes.
      </p>
      <ul ref={list} role="tree" aria-label="Guide outline" aria-describedby="outline-keys" className="space-y-0.5">
        {allRows.map((row, i) => {
          const s = byId.get(row.stepId);
          if (!s) return null;
          const isUnconnected = row.unconnected === true;
          const nProblems = problemCount.get(s.id) ?? 0;
          return (
            <li key={`${row.stepId}-${i}`} role="none">
              {isUnconnected && i === rows.length ? <p className="mt-3 mb-1 text-xs font-semibold uppercase tracking-wide text-danger">Not connected to the start</p> : null}
              <div
                data-row
                role="treeitem"
                aria-level={row.depth + 1}
                aria-selected={selected === s.id}
                aria-expanded={row.hasChildren ? !collapsed.has(s.id) : undefined}
                tabIndex={selected === s.id || (selected === null && i === 0) ? 0 : -1}
                onClick={() => actions.select(s.id)}
                onFocus={() => actions.select(s.id)}
                onKeyDown={(e) => onKey(e, i)}
                style={{ paddingLeft: `${row.depth * 1.1 + 0.4}rem` }}
                className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-md pr-2 ${selected === s.id ? 'bg-amber-wash ring-2 ring-amber-line' : 'hover:bg-paper-sunk'} ${matches(s) ? '' : 'opacity-40'}`}
              >
                {row.via ? <span className="max-w-24 shrink-0 truncate text-xs text-ink-soft">{row.via} →</span> : null}
                <StepKindBadge kind={s.kind} compact />
                <span className={`min-w-0 flex-1 truncate ${row.repeat ? 'italic text-ink-soft' : ''}`}>
                  {row.repeat ? `goes to “${s.title || s.id}”` : s.title || <span className="text-ink-faint">Untitled {s.kind} step</span>}
                </span>
                {content.startStepId === s.id ? <span className="rounded bg-paper-sunk px-1 text-xs">start</span> : null}
                {changes?.get(s.id) ? (
                  <span className={`rounded px-1 text-xs font-semibold ${changes.get(s.id) === 'added' ? 'bg-fixed-wash text-fixed' : 'bg-amber-wash text-amber-deep'}`}>
                    {changes.get(s.id) === 'added' ? 'new' : 'changed'}
                  </span>
                ) : null}
                {flags[s.id] ? (
                  <span className="rounded bg-amber-wash px-1 text-xs text-amber-deep" title="Technicians flagged this step">
                    ⚑ {flags[s.id]}
                  </span>
                ) : null}
                {nProblems ? <span className="rounded bg-danger-wash px-1 text-xs font-semibold text-danger-deep">{nProblems} to fix</span> : null}
              </div>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
