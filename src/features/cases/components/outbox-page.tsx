// Admin: every e-mail Beadpath sent or tried to send, with its text and HTML, its delivery state
// and what went wrong, so a missing invitation or summary can be found and sent again.
import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router';
import { MAIL_KIND_LABELS, MAIL_STATUSES, MAIL_STATUS_LABELS, type MailStatus, type OutboxItem } from '@/shared/schemas/cases';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { EmptyState, ListSkeleton, LoadingBlock, Notice } from '@/components/ui/feedback';
import { Card, PageHeader } from '@/components/ui/page';
import { useOutbox, useOutboxMessage, useResend } from '../api/cases';
import { when } from './case-bits';

const STATUS_STYLE: Record<MailStatus, string> = {
  queued: 'border-rule-strong bg-paper-sunk text-ink',
  sending: 'border-amber-line bg-amber-wash text-amber-deep',
  retrying: 'border-amber bg-amber-wash text-amber-deep',
  sent: 'border-fixed bg-fixed-wash text-fixed',
  failed: 'border-danger bg-danger-wash text-danger-deep',
};

function MailBadge({ status }: { status: MailStatus }) {
  return <span className={`inline-flex whitespace-nowrap rounded-full border px-2.5 py-0.5 text-sm font-semibold ${STATUS_STYLE[status]}`}>{MAIL_STATUS_LABELS[status]}</span>;
}

function MessageView({ id }: { id: number }) {
  const msg = useOutboxMessage(id);
  const resend = useResend();
  const [tab, setTab] = useState<'text' | 'html'>('html');
  if (msg.isPending) return <LoadingBlock label="Opening the message" />;
  if (msg.isError)
    return (
      <Notice tone="error" title="The message could not be opened">
        {errorMessage(msg.error)}
      </Notice>
    );
  const m = msg.data;
  return (
    <Card className="space-y-3">
      <h2 className="text-xl font-semibold">{m.subject}</h2>
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
        <dt className="text-ink-soft">From</dt>
        <dd className="break-all">{m.from}</dd>
        <dt className="text-ink-soft">To</dt>
        <dd className="break-all">{m.to}</dd>
        <dt className="text-ink-soft">Kind</dt>
        <dd>
          {MAIL_KIND_LABELS[m.kind]}
          {m.caseId ? ` · case ${m.caseId}` : ''}
        </dd>
        <dt className="text-ink-soft">Written</dt>
        <dd>{when(m.createdAt)}</dd>
        <dt className="text-ink-soft">State</dt>
        <dd className="flex flex-wrap items-center gap-2">
          <MailBadge status={m.status} />
          <span>
            {m.attempts} attempt{m.attempts === 1 ? '' : 's'}
            {m.sentAt ? ` · sent ${when(m.sentAt)}` : ''}
          </span>
        </dd>
        {m.capturedAt ? (
          <>
            <dt className="text-ink-soft">Received</dt>
            <dd>by the local mail catcher, {when(m.capturedAt)}</dd>
          </>
        ) : null}
      </dl>
      {m.lastError ? (
        <Notice tone={m.status === 'failed' ? 'error' : 'warn'} title={m.status === 'failed' ? 'Not delivered' : 'Not delivered yet: Beadpath tries again'}>
          {m.lastError}
        </Notice>
      ) : null}
      {m.status === 'failed' ? (
        <Button busy={resend.isPending} onClick={() => resend.mutate(m.id)}>
          Send again
        </Button>
      ) : null}
      {m.hidden ? (
        <Notice tone="info" title="The one-time link in this message is withheld here">
          It belongs to the person it was sent to.
        </Notice>
      ) : null}
      <div role="tablist" aria-label="Message part" className="flex gap-2 border-b border-rule">
        {(['html', 'text'] as const).map((t) => (
          <button
            key={t}
            role="tab"
            type="button"
            aria-selected={tab === t}
            onClick={() => setTab(t)}
            className={`min-h-11 px-3 font-semibold ${tab === t ? 'border-b-2 border-amber text-amber-deep' : 'text-ink-soft'}`}
          >
            {t === 'html' ? 'As the recipient sees it' : 'Plain text'}
          </button>
        ))}
      </div>
      {tab === 'html' && m.html ? (
        // Sandboxed with nothing allowed: the message's HTML can neither run nor reach the app.
        <iframe title={`Message: ${m.subject}`} sandbox="" srcDoc={m.html} className="h-[32rem] w-full rounded border border-rule bg-white" />
      ) : (
        <pre className="max-h-[32rem] overflow-auto whitespace-pre-wrap rounded bg-paper-sunk p-3 text-sm">{m.text}</pre>
      )}
    </Card>
  );
}

function Row({ m, selected, onOpen }: { m: OutboxItem; selected: boolean; onOpen: () => void }) {
  return (
    <li>
      <button
        type="button"
        onClick={onOpen}
        aria-current={selected || undefined}
        className={`block w-full rounded-lg border p-3 text-left ${selected ? 'border-amber bg-amber-wash' : 'border-rule bg-paper-raised hover:bg-paper-sunk'}`}
      >
        <span className="flex flex-wrap items-start justify-between gap-2">
          <span className="font-semibold">{m.subject}</span>
          <MailBadge status={m.status} />
        </span>
        <span className="mt-1 block text-sm text-ink-soft">
          To <span className="break-all">{m.to}</span> · {MAIL_KIND_LABELS[m.kind]} · <span className="whitespace-nowrap">{when(m.createdAt)}</span>
        </span>
        {m.status === 'failed' || m.status === 'retrying' ? <span className="mt-1 block text-sm font-semibold text-danger">{m.lastError}</span> : null}
      </button>
    </li>
  );
}

export function OutboxPage() {
  const [params, setParams] = useSearchParams();
  const status = params.get('status') ?? 'all';
  const page = Math.max(1, Number(params.get('page') ?? 1) || 1);
  const selected = params.get('id') ? Number(params.get('id')) : null;
  const list = useOutbox({ status, page, pageSize: 25 });
  const set = (patch: Record<string, string | null>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(patch))
      if (v === null) next.delete(k);
      else next.set(k, v);
    setParams(next, { replace: true });
  };
  const viewRef = useRef<HTMLDivElement>(null);
  useEffect(() => {
    // On a phone the message opens below the list; bring it into view.
    if (selected && window.innerWidth < 1024) viewRef.current?.scrollIntoView({ block: 'start' });
  }, [selected]);
  const counts = list.data?.counts;
  const total = counts ? Object.values(counts).reduce((a, b) => a + b, 0) : null;

  return (
    <div>
      <PageHeader title="Outbox" lead="Every e-mail Beadpath sent or tried to send: invitations, password resets, hand-offs and summaries to callers." />
      {list.data?.fake ? (
        <div className="mb-4">
          <Notice tone="info" title="No mail server is set up">
            Beadpath keeps each message here with a local mail catcher and nobody receives it. Set SMTP_URL (or SMTP_HOST) to send for real.
          </Notice>
        </div>
      ) : null}
      <div className="-mx-4 mb-4 flex gap-2 overflow-x-auto px-4 pb-1 sm:mx-0 sm:flex-wrap sm:overflow-visible sm:px-0" role="group" aria-label="Messages by state">
        {(['all', ...MAIL_STATUSES] as const).map((s) => (
          <button
            key={s}
            type="button"
            aria-pressed={status === s}
            onClick={() => set({ status: s === 'all' ? null : s, page: null })}
            className={`inline-flex min-h-11 shrink-0 items-center gap-2 rounded-full border px-4 font-semibold ${status === s ? 'border-amber bg-amber-wash text-amber-deep' : 'border-rule-strong bg-paper-raised hover:bg-paper-sunk'}`}
          >
            {s === 'all' ? 'All' : MAIL_STATUS_LABELS[s]}
            <span className="tabular rounded-full bg-paper-sunk px-2 text-sm">{s === 'all' ? (total ?? '–') : (counts?.[s] ?? '–')}</span>
          </button>
        ))}
      </div>
      <div className="grid gap-5 lg:grid-cols-[minmax(0,26rem)_1fr]">
        <div>
          {list.isPending ? (
            <ListSkeleton label="Loading messages" />
          ) : list.isError ? (
            <Notice tone="error" title="The outbox could not be loaded">
              {errorMessage(list.error)}
            </Notice>
          ) : list.data.messages.length === 0 ? (
            <EmptyState title="No message here">Invitations, password resets and case e-mails appear as soon as they are written.</EmptyState>
          ) : (
            <>
              <ul className="space-y-2">
                {list.data.messages.map((m) => (
                  <Row key={m.id} m={m} selected={m.id === selected} onOpen={() => set({ id: String(m.id) })} />
                ))}
              </ul>
              <div className="mt-3 flex items-center justify-between gap-2">
                <p className="text-sm text-ink-soft tabular">
                  Page {page} of {Math.max(1, Math.ceil(list.data.total / list.data.pageSize))}
                </p>
                <div className="flex gap-2">
                  <Button variant="secondary" disabled={page <= 1} onClick={() => set({ page: String(page - 1) })}>
                    Newer
                  </Button>
                  <Button variant="secondary" disabled={page * list.data.pageSize >= list.data.total} onClick={() => set({ page: String(page + 1) })}>
                    Older
                  </Button>
                </div>
              </div>
            </>
          )}
        </div>
        <div ref={viewRef} className="scroll-mt-20">
          {selected ? <MessageView key={selected} id={selected} /> : <p className="hidden text-ink-soft lg:block">Choose a message to read it.</p>}
        </div>
      </div>
    </div>
  );
}
