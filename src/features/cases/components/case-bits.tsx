// Small pieces every case page uses: status and priority badges, ages in words, places and callers.
import { CASE_PRIORITY_LABELS, CASE_STATUS_LABELS, type CasePriority, type CaseStatus } from '@/shared/case-states';
import type { CaseListItem } from '@/shared/schemas/cases';
import { formatDateTime } from '@/lib/format';

// Colour is never the only signal: every badge carries its word.
const STATUS_STYLE: Record<CaseStatus, string> = {
  new: 'border-amber-line bg-amber-wash text-amber-deep',
  'in-progress': 'border-rule-strong bg-paper-raised text-ink',
  waiting: 'border-rule-strong bg-paper-sunk text-ink-soft',
  'handed-off': 'border-amber bg-paper-raised text-amber-deep',
  resolved: 'border-fixed bg-fixed-wash text-fixed',
  closed: 'border-rule bg-paper-sunk text-ink-soft',
};

export function StatusBadge({ status }: { status: CaseStatus }) {
  return (
    <span data-status={status} className={`inline-flex items-center whitespace-nowrap rounded-full border px-2.5 py-0.5 text-sm font-semibold ${STATUS_STYLE[status]}`}>
      {CASE_STATUS_LABELS[status]}
    </span>
  );
}

export function PriorityBadge({ priority }: { priority: CasePriority }) {
  if (priority === 'normal') return <span className="text-sm text-ink-soft">Normal</span>;
  const style = priority === 'urgent' ? 'bg-danger text-white' : priority === 'high' ? 'border border-danger text-danger-deep' : 'text-ink-soft';
  return <span className={`inline-flex whitespace-nowrap rounded px-2 py-0.5 text-sm font-semibold ${style}`}>{CASE_PRIORITY_LABELS[priority]}</span>;
}

/** "4 min", "3 h", "2 days": how long the caller has been waiting. */
export function ago(iso: string, now = Date.now()): string {
  const minutes = Math.max(0, Math.round((now - new Date(iso).getTime()) / 60_000));
  if (minutes < 1) return 'just now';
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.round(minutes / 60);
  if (hours < 48) return `${hours} h`;
  return `${Math.round(hours / 24)} days`;
}

/** "just now" or "4 min ago", for things that happened rather than waits. */
export function since(iso: string): string {
  const a = ago(iso);
  return a === 'just now' ? a : `${a} ago`;
}

export function when(iso: string): string {
  return formatDateTime(iso);
}

export function placeOf(c: Pick<CaseListItem, 'site' | 'line' | 'applicator'>): string {
  return [c.site, c.line, c.applicator && `valve ${c.applicator}`].filter(Boolean).join(' · ') || 'Place not given';
}

export function callerOf(c: Pick<CaseListItem, 'callerName' | 'callerCompany'>): string {
  return c.callerName ?? c.callerCompany ?? 'Unknown caller';
}
