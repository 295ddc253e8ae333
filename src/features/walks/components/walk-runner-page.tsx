// Walking a guide on a phone: one step per screen, cautions first, the answer in one tap, the
// saved / waiting-to-send state always visible. Colleagues who open the walk see it live.
import { lazy, Suspense, useEffect, useRef, useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import { useQuery } from '@tanstack/react-query';
import { STEP_KIND_LABELS } from '@/shared/guides/labels';
import type { Step } from '@/shared/guides/schema';
import { previousStepId } from '@/shared/walks/walk-path-core';
import type { WalkDetail } from '@/shared/schemas/walks';
import { api, ApiError, errorMessage } from '@/lib/api-client';
import { useCan, useMe } from '@/lib/auth';
import { showToast } from '@/lib/toasts';
import { useAfterFirstView } from '@/lib/use-after-first-view';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { NotFoundPage } from '@/components/errors/route-error';
import { useWalk, useWalkApplicator } from '../api/walks';
import { useWalkRunner } from '../hooks/use-walk-runner';
import { AskView, CautionGate, FindingView, HandoffView, MeasureView, TryView } from './step-views';
import { StepKindIcon } from './step-kind-icon';
import { WalkPath } from './walk-path';

const NoteDialog = lazy(() => import('./walk-dialogs').then((m) => ({ default: m.NoteDialog })));
const FlagDialog = lazy(() => import('./walk-dialogs').then((m) => ({ default: m.FlagDialog })));
const AbandonDialog = lazy(() => import('./walk-dialogs').then((m) => ({ default: m.AbandonDialog })));

export function WalkRunnerPage() {
  const id = Number(useParams().id);
  const { data: me } = useMe();
  const walk = useWalk(id);
  const live = walk.data && walk.data.userId !== me?.user.id;
  const polled = useWalk(id, { poll: Boolean(live && walk.data?.status === 'open') });
  if (walk.isPending) return <LoadingBlock label="Opening the walk" />;
  if (walk.isError) {
    if (walk.error instanceof ApiError && walk.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The walk could not be opened">
        {errorMessage(walk.error)}
      </Notice>
    );
  }
  const data = polled.data ?? walk.data;
  if (live || data.status === 'abandoned') return <WalkWatch walk={data} live={Boolean(live)} />;
  return <Runner key={data.id} walk={data} />;
}

function SyncBadge({ sync, waiting }: { sync: string; waiting: number }) {
  const words = sync === 'saved' ? 'Saved' : sync === 'sending' ? 'Sending…' : `${waiting} waiting to send`;
  return (
    <span
      role="status"
      aria-live="polite"
      data-sync={sync === 'saved' ? 'saved' : 'waiting'}
      className={`rounded-full px-3 py-1 text-sm font-semibold ${sync === 'saved' ? 'bg-fixed-wash text-fixed' : 'bg-amber-wash text-amber-deep'}`}
    >
      {words}
    </span>
  );
}

function Runner({ walk }: { walk: WalkDetail }) {
  const { data: me } = useMe();
  const navigate = useNavigate();
  const run = useWalkRunner(walk);
  const applicator = useWalkApplicator(walk.applicatorId ?? null);
  // The causes list serves only a Finding's "fixed by something else"; read once the step is up, so
  // it is on the phone before the walk reaches a Finding (with or without signal).
  const afterFirstView = useAfterFirstView();
  const causes = useQuery({
    queryKey: ['causes'],
    queryFn: () => api<{ causes: { code: string; label: string; active: boolean }[] }>('/api/causes').then((r) => r.causes),
    staleTime: 300_000,
    enabled: afterFirstView,
  });
  const [busy, setBusy] = useState(false);
  const [noteOpen, setNoteOpen] = useState(false);
  const [flagOpen, setFlagOpen] = useState(false);
  const [abandonOpen, setAbandonOpen] = useState(false);
  // Once opened, the dialogs stay mounted so a note typed and closed is still there.
  const dialogsLoaded = useRef(false);
  const dialogsWanted = noteOpen || flagOpen || abandonOpen || dialogsLoaded.current;
  if (dialogsWanted) dialogsLoaded.current = true;
  const canRecordService = useCan('assets:record');
  const canReadCases = useCan('cases:read');
  const steps = walk.guide.content.steps as Step[];
  const state = run.state;
  const stepId = state.at;
  const step = steps.find((s) => s.id === stepId);
  const position = state.path.length;
  // A Finding waits for its outcome although the path already ends there.
  const awaitingOutcome = state.ended === 'finding' && !state.outcome;
  const disabled = state.unacknowledged.length > 0 || (state.current === null && !awaitingOutcome);
  const system = me?.user.unitSystem ?? 'metric';
  const prev = previousStepId(state);

  const submit = async (a: Parameters<typeof run.answer>[0]) => {
    setBusy(true);
    try {
      const problem = await run.answer(a);
      if (!problem) window.scrollTo({ top: 0 });
      return problem;
    } finally {
      setBusy(false);
    }
  };

  const ended = state.ended !== null && (state.ended !== 'finding' || state.outcome);
  // A fix confirmed at a Finding on a registered applicator is worth a service record, prefilled.
  const fixedCause = state.outcome?.outcome === 'fixed' && step?.kind === 'finding' ? step.causeCode : state.outcome?.outcome === 'fixed-by-other' ? state.outcome.causeCode : undefined;
  const serviceLink =
    ended && state.ended === 'finding' && walk.applicatorId && canRecordService && state.outcome?.outcome !== 'not-fixed'
      ? `/applicators/${walk.applicatorId}/service/new?walkId=${walk.id}${fixedCause ? `&cause=${encodeURIComponent(fixedCause)}` : ''}`
      : null;
  // An answer given while the previous one was still sending waits for the next round; the
  // service link waits for it, so send it now rather than in a quarter of a minute.
  const { sync, flush } = run;
  useEffect(() => {
    if (!serviceLink || sync !== 'waiting' || !navigator.onLine) return;
    // A second apart, so a server that keeps failing is not asked in a tight loop.
    const t = setTimeout(() => void flush(), 1000);
    return () => clearTimeout(t);
  }, [serviceLink, sync, flush]);

  // The walk's readings go through a calculator that is still loading.
  if (!run.ready) return <LoadingBlock label="Opening the walk" />;
  if (!step) return <Notice tone="error" title="This walk points at a step its guide does not have." />;

  return (
    <div className="mx-auto flex max-w-xl flex-col pb-24">
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <p className="text-sm text-ink-soft">
          {walk.guide.title} · step {position}
        </p>
        <SyncBadge sync={run.sync} waiting={run.waiting} />
      </div>
      {run.error ? (
        <div className="mb-3">
          <Notice tone="error" title={run.error} />
          <Button variant="quiet" onClick={run.clearError}>
            Dismiss
          </Button>
        </div>
      ) : null}

      {ended ? (
        <section className="space-y-4" aria-label="Walk ended">
          <div className={`rounded-md border-2 p-4 ${state.outcome?.outcome === 'fixed' || state.ended === 'fixed-by-try' ? 'border-fixed bg-fixed-wash' : 'border-rule-strong bg-paper-sunk'}`}>
            <h1 className="text-2xl font-semibold">
              {state.ended === 'handoff'
                ? 'Handed off'
                : state.ended === 'fixed-by-try' || state.outcome?.outcome === 'fixed'
                  ? 'Fixed'
                  : state.outcome?.outcome === 'fixed-by-other'
                    ? 'Fixed by something else'
                    : 'Not fixed'}
            </h1>
            <p className="mt-1">{step.title}</p>
          </div>
          {state.ended === 'handoff' && step.kind === 'handoff' ? <HandoffView step={step} walkId={walk.id} /> : null}
          {serviceLink && run.sync === 'saved' ? (
            <Link to={serviceLink} className="inline-flex min-h-14 w-full items-center justify-center rounded-md bg-amber text-lg font-semibold text-white hover:bg-amber-deep">
              Record service event
            </Link>
          ) : serviceLink ? (
            // Leaving before the outcome reaches the server would leave the walk open there.
            <p className="rounded-md border border-amber-line bg-amber-wash p-3 text-center font-semibold text-amber-deep" role="status">
              Record service event: waiting for the walk to be saved…
            </p>
          ) : null}
          {walk.caseId !== null && canReadCases ? (
            <Link to={`/cases/${walk.caseId}`} className="inline-flex min-h-14 w-full items-center justify-center rounded-md bg-amber text-lg font-semibold text-white hover:bg-amber-deep">
              Back to case #{walk.caseId}
            </Link>
          ) : null}
          <Link to={`/walks/${walk.id}/summary`} className="inline-flex min-h-14 w-full items-center justify-center rounded-md border border-rule-strong bg-paper-raised text-lg font-semibold">
            See the record
          </Link>
          <Link to="/" className="inline-flex min-h-11 w-full items-center justify-center font-semibold text-amber-deep underline">
            Home
          </Link>
        </section>
      ) : (
        <section aria-labelledby="step-title" className="space-y-4">
          <div>
            <p className="flex items-center gap-1 text-sm font-semibold text-ink-soft">
              <StepKindIcon kind={step.kind} /> {STEP_KIND_LABELS[step.kind]}
            </p>
            <h1 id="step-title" className="text-2xl font-semibold leading-snug">
              {step.title}
            </h1>
          </div>
          <CautionGate step={step} unacknowledged={state.unacknowledged} busy={busy} onAcknowledge={() => void submit({ kind: 'acknowledge', stepId: step.id, cautionIds: state.unacknowledged })} />
          {step.body?.html ? <div className="prose-bp" dangerouslySetInnerHTML={{ __html: step.body.html }} /> : null}
          {step.articleIds.length ? (
            <p className="text-sm">
              Read more:{' '}
              {step.articleIds.map((a, i) => (
                <span key={a}>
                  {i ? ', ' : ''}
                  <Link className="font-semibold text-amber-deep underline" to={`/articles/${a}`}>
                    article {a}
                  </Link>
                </span>
              ))}
            </p>
          ) : null}
          <div className={disabled ? 'opacity-50' : ''} aria-disabled={disabled}>
            {step.kind === 'ask' ? <AskView key={step.id} step={step} disabled={disabled || busy} previous={state.previousAnswer} submit={submit} /> : null}
            {step.kind === 'measure' ? (
              <MeasureView key={`${step.id}-${applicator.data ? 'known' : 'unknown'}`} step={step} disabled={disabled || busy} system={system} submit={submit} specs={applicator.data} />
            ) : null}
            {step.kind === 'try' ? <TryView key={step.id} step={step} disabled={disabled || busy} submit={submit} /> : null}
            {step.kind === 'finding' ? <FindingView key={step.id} step={step} disabled={disabled || busy} causes={(causes.data ?? []).filter((c) => c.active)} submit={submit} /> : null}
            {step.kind === 'handoff' ? <HandoffView step={step} walkId={walk.id} /> : null}
          </div>
        </section>
      )}

      <div className="mt-6 flex flex-wrap gap-2 border-t border-rule pt-4 text-sm">
        <Button variant="secondary" onClick={() => setNoteOpen(true)}>
          Note or photo
        </Button>
        <Button variant="quiet" onClick={() => setFlagOpen(true)}>
          This step is wrong or unclear
        </Button>
        {!ended ? (
          <Button variant="quiet" onClick={() => setAbandonOpen(true)}>
            Stop this walk
          </Button>
        ) : null}
      </div>
      <details className="mt-4">
        <summary className="min-h-11 cursor-pointer font-semibold">The path so far</summary>
        <WalkPath steps={steps} state={state} />
      </details>

      {prev && !ended ? (
        <div className="fixed inset-x-0 bottom-0 z-20 border-t border-rule bg-paper/95 px-4 py-2 backdrop-blur">
          <div className="mx-auto max-w-xl">
            <Button variant="secondary" className="w-full" disabled={busy} onClick={() => void submit({ kind: 'back', stepId: prev })}>
              ← Back one step
            </Button>
          </div>
        </div>
      ) : null}

      {/* The dialogs load on first use: the first view of a step does not wait for them. */}
      {dialogsWanted ? (
        <Suspense fallback={null}>
          <NoteDialog
            open={noteOpen}
            onClose={() => setNoteOpen(false)}
            onSave={async (text, fileIds) => {
              await run.addNote(step.id, text, fileIds);
              showToast('Note kept', 'ok');
            }}
          />
          <FlagDialog open={flagOpen} onClose={() => setFlagOpen(false)} walkId={walk.id} stepId={step.id} />
          <AbandonDialog open={abandonOpen} onClose={() => setAbandonOpen(false)} walkId={walk.id} onStopped={() => navigate('/')} />
        </Suspense>
      ) : null}
    </div>
  );
}

function WalkWatch({ walk, live }: { walk: WalkDetail; live: boolean }) {
  const steps = walk.guide.content.steps as Step[];
  const at = steps.find((s) => s.id === walk.state.at);
  return (
    <div className="mx-auto max-w-2xl space-y-4">
      <p className="text-sm text-ink-soft">
        {walk.userName ?? 'A colleague'} is walking “{walk.guide.title}”{walk.site ? ` at ${walk.site}` : ''}
        {walk.line ? `, ${walk.line}` : ''}
        {walk.applicator ? `, valve ${walk.applicator}` : ''}.{live && walk.status === 'open' ? ' This page follows along every few seconds.' : ''}
      </p>
      <h1 className="text-2xl font-semibold">{walk.status === 'open' ? `Now at: ${at?.title ?? '—'}` : walk.status === 'abandoned' ? 'Stopped' : 'Ended'}</h1>
      <WalkPath steps={steps} state={walk.state} />
      <Link to={`/walks/${walk.id}/summary`} className="font-semibold text-amber-deep underline">
        The record
      </Link>
    </div>
  );
}
