// One case: the call, the walks done with the caller, what to do next (walk, hand off, send the
// summary, change the status) and the timeline with notes and attachments.
import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router';
import { CASE_STATUS_LABELS, type CaseDetail, type CaseEvent, type CaseStatus } from '@/shared/schemas/cases';
import { MAIL_STATUS_LABELS } from '@/shared/schemas/cases';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useMe } from '@/lib/auth';
import { serverFieldErrors } from '@/lib/form-errors';
import { showToast } from '@/lib/toasts';
import { percent, uploadFile } from '@/lib/uploads';
import { NotFoundPage } from '@/components/errors/route-error';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { inputClass } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { Card } from '@/components/ui/page';
import { useAddCaseNote, useCase, useSetCaseStatus } from '../api/cases';
import { PriorityBadge, StatusBadge, callerOf, since, when } from './case-bits';
import { EditCaseDialog, HandoffDialog, SummaryDialog } from './case-dialogs';
import { WalkWithCaller } from './walk-with-caller';

function eventWords(e: CaseEvent): string {
  switch (e.kind) {
    case 'created':
      return 'logged the call';
    case 'edited':
      return e.text ? e.text.charAt(0).toLowerCase() + e.text.slice(1) : 'edited the case';
    case 'note':
      return 'added a note';
    case 'status':
      return `moved it from ${e.fromStatus ? CASE_STATUS_LABELS[e.fromStatus].toLowerCase() : '?'} to ${e.toStatus ? CASE_STATUS_LABELS[e.toStatus].toLowerCase() : '?'}`;
    case 'assigned':
      return e.assignee ? `assigned it to ${e.assignee.name}` : 'took the assignment off';
    case 'walk':
      return `walked “${e.walk?.guideTitle ?? 'a guide'}” with the caller`;
    case 'handoff':
      return `handed it to ${e.assignee?.name ?? 'a colleague'}`;
    case 'email':
      return `sent an e-mail: ${e.text ?? e.mail?.subject ?? ''}`;
  }
}

function Timeline({ events }: { events: CaseEvent[] }) {
  return (
    <ol className="space-y-3" aria-label="Timeline">
      {events.map((e) => (
        <li key={e.id} className="relative border-l-2 border-rule pl-4" data-event={e.kind}>
          <p className="text-sm">
            <span className="font-semibold">{e.userName ?? 'Someone'}</span> {eventWords(e)}
            <span className="text-ink-soft"> · {when(e.createdAt)}</span>
          </p>
          {e.text && (e.kind === 'note' || e.kind === 'handoff' || e.kind === 'status') ? <p className="mt-1 whitespace-pre-wrap rounded-md bg-paper-sunk p-2">{e.text}</p> : null}
          {e.walk && (e.kind === 'walk' || e.kind === 'handoff') ? (
            <Link to={`/walks/${e.walk.id}/summary`} className="mt-1 inline-block text-sm font-semibold text-amber-deep underline">
              The walk’s record
            </Link>
          ) : null}
          {e.mail ? (
            <p className={`mt-1 text-sm ${e.mail.status === 'failed' ? 'font-semibold text-danger' : 'text-ink-soft'}`}>
              To {e.mail.to}: {MAIL_STATUS_LABELS[e.mail.status].toLowerCase()}
              {e.mail.status !== 'sent' && e.mail.lastError ? ` (${e.mail.lastError})` : ''}
            </p>
          ) : null}
          {e.files.length ? (
            <ul className="mt-2 flex flex-wrap gap-2">
              {e.files.map((f) => (
                <li key={f.id}>
                  {f.kind === 'photo' && f.urls.thumb ? (
                    <a href={f.urls.display ?? f.urls.original ?? f.urls.thumb} target="_blank" rel="noreferrer">
                      <img src={f.urls.thumb} alt={f.originalName} className="size-24 rounded border border-rule object-cover" />
                    </a>
                  ) : (
                    <a
                      href={f.urls.original ?? Object.values(f.urls)[0]}
                      className="inline-flex min-h-11 items-center rounded border border-rule px-3 text-sm font-semibold text-amber-deep underline"
                      target="_blank"
                      rel="noreferrer"
                    >
                      {f.originalName}
                    </a>
                  )}
                </li>
              ))}
            </ul>
          ) : null}
        </li>
      ))}
    </ol>
  );
}

function NoteForm({ caseId }: { caseId: number }) {
  const add = useAddCaseNote(caseId);
  const [text, setText] = useState('');
  const [files, setFiles] = useState<{ id: string; name: string }[]>([]);
  // null: nothing sending; otherwise the share of the file sent so far.
  const [uploading, setUploading] = useState<number | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});

  function submit(e: FormEvent) {
    e.preventDefault();
    add.mutate(
      { text: text.trim(), fileIds: files.map((f) => f.id) },
      {
        onSuccess: () => {
          setText('');
          setFiles([]);
          setFields({});
        },
        onError: (err) => setFields(serverFieldErrors(err)),
      },
    );
  }

  return (
    <form onSubmit={submit} noValidate className="mt-4 space-y-2 border-t border-rule pt-4">
      <label htmlFor="case-note" className="block text-sm font-semibold">
        Add a note
      </label>
      <textarea
        id="case-note"
        rows={3}
        className={inputClass}
        value={text}
        onChange={(e) => setText(e.target.value)}
        placeholder="What the caller said, what you agreed"
        aria-invalid={fields.text ? true : undefined}
      />
      {fields.text || fields.fileIds ? <p className="text-sm font-semibold text-danger">{fields.text ?? fields.fileIds}</p> : null}
      {files.length ? (
        <ul className="flex flex-wrap gap-2 text-sm">
          {files.map((f) => (
            <li key={f.id} className="rounded border border-rule bg-paper-raised px-2 py-1">
              {f.name}
            </li>
          ))}
        </ul>
      ) : null}
      <div className="flex flex-wrap items-center gap-2">
        <label className="inline-flex min-h-11 cursor-pointer items-center rounded-md border border-rule-strong bg-paper-raised px-4 font-semibold">
          <span aria-live="polite">{uploading !== null ? `Uploading… ${percent(uploading)}` : 'Attach a photo or file'}</span>
          <input
            type="file"
            className="sr-only"
            onChange={async (e) => {
              const f = e.target.files?.[0];
              e.target.value = '';
              if (!f) return;
              setUploading(0);
              try {
                const up = await uploadFile(f, { onProgress: setUploading });
                setFiles((x) => [...x, { id: up.id, name: up.originalName }]);
              } catch (err) {
                showToast(`The file was not attached: ${errorMessage(err)}`, 'error');
              } finally {
                setUploading(null);
              }
            }}
          />
        </label>
        <Button type="submit" busy={add.isPending} disabled={uploading !== null || (!text.trim() && !files.length)}>
          Add note
        </Button>
      </div>
    </form>
  );
}

function StatusControl({ kase }: { kase: CaseDetail }) {
  const setStatus = useSetCaseStatus(kase.id);
  const [to, setTo] = useState<CaseStatus | ''>('');
  if (!kase.canChangeStatus || !kase.allowedStatuses.length) return null;
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (to) setStatus.mutate({ status: to }, { onSuccess: () => setTo('') });
      }}
    >
      <label className="min-w-0 flex-1 text-sm font-semibold">
        Change status
        <select className={`${inputClass} mt-1 font-normal`} value={to} onChange={(e) => setTo(e.target.value as CaseStatus)}>
          <option value="">Choose…</option>
          {kase.allowedStatuses.map((s) => (
            <option key={s} value={s}>
              {CASE_STATUS_LABELS[s]}
            </option>
          ))}
        </select>
      </label>
      <Button type="submit" variant="secondary" disabled={!to} busy={setStatus.isPending}>
        Change
      </Button>
    </form>
  );
}

function LinkedWalks({ kase, myId }: { kase: CaseDetail; myId: number | undefined }) {
  if (!kase.walks.length) return null;
  return (
    <Card>
      <h2 className="text-lg font-semibold">Walks with the caller</h2>
      <ul className="mt-2 space-y-2">
        {kase.walks.map((w) => {
          const result =
            w.status === 'open'
              ? 'In progress'
              : w.status === 'abandoned'
                ? 'Stopped'
                : w.endKind === 'handoff'
                  ? 'Ended at a hand-off'
                  : w.outcome === 'not-fixed'
                    ? 'Not fixed'
                    : w.outcome === 'fixed-by-other'
                      ? 'Fixed by something else'
                      : 'Fixed';
          return (
            <li key={w.id} className="rounded-md border border-rule p-3" data-walk={w.id}>
              <p className="font-semibold">{w.guideTitle}</p>
              <p className="text-sm">
                <span className={w.outcome === 'fixed' || w.endKind === 'fixed-by-try' ? 'font-semibold text-fixed' : 'font-semibold'}>{result}</span>
                {w.stepTitle ? <span className="text-ink-soft"> · {w.stepTitle}</span> : null}
                <span className="text-ink-soft">
                  {' '}
                  · {w.userName ?? 'someone'}, {since(w.startedAt)}
                </span>
              </p>
              <div className="mt-1 flex flex-wrap gap-3 text-sm">
                {w.status === 'open' ? (
                  <Link className="font-semibold text-amber-deep underline" to={`/walks/${w.id}`}>
                    {w.userId === myId ? 'Continue the walk' : 'Follow the walk'}
                  </Link>
                ) : null}
                <Link className="font-semibold text-amber-deep underline" to={`/walks/${w.id}/summary`}>
                  The record
                </Link>
              </div>
            </li>
          );
        })}
      </ul>
    </Card>
  );
}

export function CasePage() {
  const id = Number(useParams().id);
  const { data: me } = useMe();
  const kase = useCase(id);
  const [dialog, setDialog] = useState<'handoff' | 'summary' | 'edit' | null>(null);

  if (!Number.isInteger(id) || id <= 0) return <NotFoundPage />;
  if (kase.isPending) return <LoadingBlock label="Opening the case" />;
  if (kase.isError) {
    if (kase.error instanceof ApiError && kase.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The case could not be opened">
        {errorMessage(kase.error)}
      </Notice>
    );
  }
  const c = kase.data;
  const last = c.walks.at(-1);
  const walkRanOut = last && last.status === 'ended' && (last.endKind === 'handoff' || last.outcome === 'not-fixed');
  const finished = c.status === 'resolved' || c.status === 'closed';

  return (
    <div className="space-y-5">
      <div>
        <Link to="/cases" className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
          All cases
        </Link>
        <p className="mt-2 text-sm text-ink-soft">
          Case {c.id} · logged {when(c.createdAt)}
          {c.createdBy ? ` by ${c.createdBy.name}` : ''}
        </p>
        <h1 className="text-2xl font-semibold sm:text-3xl">{c.symptom}</h1>
        <div className="mt-2 flex flex-wrap items-center gap-2">
          <StatusBadge status={c.status} />
          <PriorityBadge priority={c.priority} />
          {c.assignee ? (
            <span className="text-sm">
              Assigned to <strong>{c.assignee.name}</strong>
            </span>
          ) : (
            <span className="text-sm text-ink-soft">Nobody assigned</span>
          )}
        </div>
      </div>

      <div className="grid gap-5 lg:grid-cols-[1fr_20rem]">
        <div className="space-y-5">
          {c.canWork && walkRanOut && c.status !== 'handed-off' && !finished ? (
            <Notice tone="warn" title={last.endKind === 'handoff' ? 'The guide ends here with a hand-off' : 'The remedy did not fix it'}>
              <p>Hand the case to an author or senior technician, with the walk attached.</p>
              <Button className="mt-2" onClick={() => setDialog('handoff')}>
                Hand off
              </Button>
            </Notice>
          ) : null}
          {c.canWork && !finished ? <WalkWithCaller kase={c} /> : null}
          <LinkedWalks kase={c} myId={me?.user.id} />
          <Card>
            <h2 className="text-lg font-semibold">Timeline</h2>
            <div className="mt-3">
              <Timeline events={c.events} />
            </div>
            {c.canNote ? <NoteForm caseId={c.id} /> : null}
          </Card>
        </div>

        {/* On a phone the caller's number and the next actions come first. */}
        <aside className="order-first space-y-4 lg:order-none">
          <Card>
            <h2 className="text-lg font-semibold">Caller</h2>
            <p className="mt-1 font-semibold">{callerOf(c)}</p>
            {c.callerName && c.callerCompany ? <p>{c.callerCompany}</p> : null}
            {c.callerPhone ? (
              <a href={`tel:${c.callerPhone.replace(/[^+\d]/g, '')}`} className="mt-1 flex min-h-11 items-center gap-2 font-semibold text-amber-deep underline">
                <Icon.phone /> {c.callerPhone}
              </a>
            ) : null}
            {c.callerEmail ? (
              <a href={`mailto:${c.callerEmail}`} className="flex min-h-11 items-center gap-2 break-all text-amber-deep underline">
                <Icon.mail /> {c.callerEmail}
              </a>
            ) : null}
            <h2 className="mt-4 text-lg font-semibold">Where</h2>
            <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm">
              <dt className="text-ink-soft">Site</dt>
              <dd>{c.site ?? '—'}</dd>
              <dt className="text-ink-soft">Line</dt>
              <dd>{c.line ?? '—'}</dd>
              <dt className="text-ink-soft">Valve</dt>
              <dd>
                {c.registered ? (
                  <Link to={`/applicators/${c.registered.id}`} className="text-amber-deep underline">
                    {c.registered.tag}
                  </Link>
                ) : (
                  (c.applicator ?? '—')
                )}
              </dd>
            </dl>
            {c.canWork ? (
              <Button variant="quiet" className="mt-2 !px-0" onClick={() => setDialog('edit')}>
                Edit the call
              </Button>
            ) : null}
          </Card>
          {c.canWork || c.canChangeStatus ? (
            <Card className="space-y-3">
              <h2 className="text-lg font-semibold">Next</h2>
              {c.canWork && !finished ? (
                <Button variant="secondary" className="w-full" onClick={() => setDialog('handoff')}>
                  Hand off
                </Button>
              ) : null}
              {c.canWork ? (
                <Button variant="secondary" className="w-full" onClick={() => setDialog('summary')}>
                  <Icon.mail /> Send the summary
                </Button>
              ) : null}
              <StatusControl kase={c} />
            </Card>
          ) : null}
        </aside>
      </div>

      {c.canWork ? (
        <>
          <HandoffDialog kase={c} open={dialog === 'handoff'} onClose={() => setDialog(null)} />
          <SummaryDialog kase={c} open={dialog === 'summary'} onClose={() => setDialog(null)} />
          <EditCaseDialog kase={c} open={dialog === 'edit'} onClose={() => setDialog(null)} />
        </>
      ) : null}
    </div>
  );
}
