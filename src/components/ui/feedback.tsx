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

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-rule-strong bg-paper-raised p-6 text-center">
      <p className="font-serif text-lg font-semibold">{title}</p>
      {children ? <div className="mt-2 text-ink-soft">{children}</div> : null}
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
