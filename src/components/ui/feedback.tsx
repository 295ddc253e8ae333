// Notices, skeletons and empty states: every wait and every failure says something.
import type { ReactNode } from 'react';
import { dismissToast, useToasts } from '@/lib/toasts';

const tones = {
  error: 'border-danger bg-danger-wash text-danger-deep',
  ok: 'border-fixed bg-fixed-wash text-fixed',
  info: 'border-rule-strong bg-paper-raised text-ink',
  warn: 'border-amber-line bg-amber-wash text-amber-deep',
};

export function Notice({ tone = 'info', title, children }: { tone?: keyof typeof tones; title?: ReactNode; children?: ReactNode }) {
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`rounded-md border-l-4 px-4 py-3 ${tones[tone]}`}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className="text-sm">{children}</div> : null}
    </div>
  );
}

export function Skeleton({ className = 'h-5 w-full' }: { className?: string }) {
  return <div className={`animate-pulse rounded bg-paper-sunk ${className}`} aria-hidden />;
}

/**
 * How far a long task has got: a bar with the percentage in words (value 0..1), or a moving bar
 * when the total is not known (value null). The words carry the meaning, not the bar's colour.
 */
export function ProgressBar({ label, value }: { label: string; value: number | null }) {
  const pct = value === null ? null : Math.round(Math.max(0, Math.min(1, value)) * 100);
  return (
    <div className="space-y-1" data-progress={pct ?? 'busy'}>
      <p className="text-sm font-semibold" aria-hidden>
        {label}
        {pct !== null ? ` — ${pct}%` : '…'}
      </p>
      <progress className="progress-bp h-2 w-full" aria-label={label} max={100} {...(pct !== null ? { value: pct } : {})} />
    </div>
  );
}

/** A task in named stages: done ones ticked, the current one marked, later ones waiting. */
export function StageList({ stages, current, label }: { stages: string[]; current: number; label: string }) {
  return (
    <ol className="space-y-1 text-sm" aria-label={label}>
      {stages.map((s, i) => (
        <li key={s} className={i < current ? 'text-fixed' : i === current ? 'font-semibold text-ink' : 'text-ink-soft'} aria-current={i === current ? 'step' : undefined}>
          {i < current ? '✓ ' : i === current ? '→ ' : '· '}
          {s}
          {i < current ? <span className="sr-only"> (done)</span> : i === current ? <span className="sr-only"> (in progress)</span> : <span className="sr-only"> (waiting)</span>}
        </li>
      ))}
    </ol>
  );
}

/** Rows of a list while it loads: the shape of what is coming, instead of a spinner. */
export function ListSkeleton({ rows = 5, label = 'Loading the list' }: { rows?: number; label?: string }) {
  return (
    <div role="status" aria-label={label} className="space-y-2">
      {Array.from({ length: rows }, (_, i) => (
        <div key={i} className="flex items-center gap-3 rounded-md border border-rule bg-paper-raised p-3">
          <Skeleton className="size-8 shrink-0 rounded-full" />
          <div className="flex-1 space-y-2">
            <Skeleton className={`h-4 ${i % 2 ? 'w-2/3' : 'w-1/2'}`} />
            <Skeleton className="h-3 w-1/3" />
          </div>
        </div>
      ))}
    </div>
  );
}

export function LoadingBlock({ label = 'Loading' }: { label?: string }) {
  return (
    <div className="space-y-3" role="status" aria-label={label}>
      <Skeleton className="h-7 w-1/2" />
      <Skeleton />
      <Skeleton className="h-5 w-5/6" />
      <Skeleton className="h-5 w-2/3" />
    </div>
  );
}

/** An empty list says why it is empty and what to do next (the action, when the user may take it). */
export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-rule-strong bg-paper-raised p-6 text-center" data-empty-state>
      <p className="font-serif text-lg font-semibold">{title}</p>
      {children ? <div className="mt-2 text-ink-soft">{children}</div> : null}
      {action ? <div className="mt-4 flex flex-wrap justify-center gap-2">{action}</div> : null}
    </div>
  );
}

export function Toaster() {
  const toasts = useToasts();
  return (
    <div className="pointer-events-none fixed inset-x-0 bottom-4 z-50 flex flex-col items-center gap-2 px-4" aria-live="assertive">
      {toasts.map((t) => (
        <div
          key={t.id}
          role={t.tone === 'error' ? 'alert' : 'status'}
          className={`pointer-events-auto flex w-full max-w-md items-start gap-3 rounded-md border-l-4 px-4 py-3 shadow-lg ${tones[t.tone === 'error' ? 'error' : t.tone === 'ok' ? 'ok' : 'info']}`}
        >
          <p className="flex-1 text-sm font-semibold">{t.message}</p>
          <button type="button" onClick={() => dismissToast(t.id)} className="min-h-8 px-2 text-sm underline" aria-label="Dismiss message">
            Close
          </button>
        </div>
      ))}
    </div>
  );
}
