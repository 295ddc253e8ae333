// Words for an article's state, as authors and readers see them.
import { formatDate as formatLocalDate } from '@/lib/format';
import type { ArticleSummary } from '@/shared/schemas/articles';

export function statusLabel(a: Pick<ArticleSummary, 'workflow' | 'published' | 'hasUnpublishedChanges'>): { text: string; tone: 'ok' | 'warn' | 'muted' } {
  if (a.workflow === 'archived') return { text: 'Archived', tone: 'muted' };
  if (a.workflow === 'in_review') return { text: a.published ? 'Published · changes in review' : 'In review', tone: 'warn' };
  if (a.workflow === 'published') return { text: 'Published', tone: 'ok' };
  return { text: a.published ? 'Published · changes in draft' : 'Draft', tone: 'muted' };
}

export const toneClass = {
  ok: 'bg-fixed-wash text-fixed',
  warn: 'bg-amber-wash text-amber-deep',
  muted: 'bg-paper-sunk text-ink-soft',
} as const;

export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '';
  return formatLocalDate(iso);
}
