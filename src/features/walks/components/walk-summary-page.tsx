// The record of a walk: prints on one or two pages and can be shared by link with colleagues.
import { Link, useParams } from 'react-router';
import { HAZARDS, type Hazard } from '@/shared/tags';
import { errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { useWalkSummary } from '../api/walks';
import { formatDateTime, formatTime } from '@/lib/format';

export function WalkSummaryPage() {
  const id = Number(useParams().id);
  const summary = useWalkSummary(id);
  if (summary.isPending) return <LoadingBlock label="Loading the record" />;
  if (summary.isError)
    return (
      <Notice tone="error" title="The record could not be loaded">
        {errorMessage(summary.error)}
      </Notice>
    );
  const s = summary.data;
  const share = async (text: string) => {
    if (navigator.share) {
      await navigator.share({ title: s.guideTitle, text }).catch(() => undefined);
    } else if (navigator.clipboard) {
      await navigator.clipboard.writeText(text);
      showToast('Copied: paste it into a message', 'ok');
    }
  };
  return (
    <article className="mx-auto max-w-3xl space-y-4">
      <nav className="no-print flex flex-wrap gap-3 text-sm">
        <Link className="font-semibold text-amber-deep underline" to={`/walks/${id}`}>
          Back to the walk
        </Link>
      </nav>
      <header>
        <p className="font-semibold text-amber-deep">{s.symptom}</p>
        <h1 className="text-2xl font-semibold">
          {s.guideTitle} <span className="text-base font-normal text-ink-soft">(version {s.versionNumber})</span>
        </h1>
        <p className="mt-1 text-ink-soft">
          {s.technician ?? 'Unknown'} · {[s.site, s.line, s.applicator && `valve ${s.applicator}`].filter(Boolean).join(', ') || 'place not given'} · started {formatDateTime(s.startedAt)}
          {s.endedAt ? ` · ended ${formatDateTime(s.endedAt)}` : ''}
        </p>
        <p className="mt-2 text-lg font-semibold">
          {s.status === 'open' ? 'Still open' : s.status === 'abandoned' ? 'Stopped before the end' : (s.outcomeLabel ?? (s.ended === 'handoff' ? 'Handed off' : 'Ended'))}
          {s.causeLabel ? ` · cause: ${s.causeLabel}` : ''}
        </p>
        {s.outcomeNote ? <p>{s.outcomeNote}</p> : null}
      </header>
      <div className="no-print flex flex-wrap gap-2">
        <Button variant="secondary" onClick={() => window.print()}>
          Print
        </Button>
        <Button variant="secondary" onClick={() => void share(s.handoffText ?? s.text)}>
          {s.handoffText ? 'Send the hand-off message' : 'Share as text'}
        </Button>
        <Button variant="secondary" onClick={() => navigator.clipboard?.writeText(window.location.href).then(() => showToast('Link copied', 'ok'))}>
          Copy link for a colleague
        </Button>
      </div>
      <ol className="space-y-3">
        {s.steps.map((st) => (
          <li key={`${st.stepId}-${st.position}`} className="break-inside-avoid rounded-md border border-rule bg-paper-raised p-3">
            <p className="text-xs font-semibold text-ink-soft">
              {st.position}. {st.kindLabel}
              {st.answeredAt ? ` · ${formatTime(st.answeredAt)}` : ''}
            </p>
            <p className="font-semibold">{st.title}</p>
            {st.answer ? <p>{st.answer}</p> : null}
            {st.reading?.calculator?.computed ? (
              <p className="text-sm text-ink-soft">
                {st.reading.calculator.title}: {st.reading.calculator.outputLabel} = {st.reading.calculator.computed.value.toPrecision(5)} {st.reading.calculator.computed.unit}
              </p>
            ) : null}
            {st.cautions.map((c) => (
              <p key={c.id} className="text-sm">
                <span className="font-semibold text-danger-deep">Caution ({HAZARDS[c.hazard as Hazard] ?? c.hazard})</span>:{' '}
                {c.acknowledgedAt ? `acknowledged ${formatTime(c.acknowledgedAt)}` : 'not acknowledged'}
              </p>
            ))}
            {st.notes.map((n, i) => (
              <div key={i} className="mt-1 text-sm">
                <p>Note: {n.text}</p>
                <div className="flex flex-wrap gap-2">
                  {n.fileIds.map((f) => (
                    <img key={f} src={`/api/files/${f}/thumb`} alt="Photo from the walk" className="size-24 rounded object-cover" />
                  ))}
                </div>
              </div>
            ))}
          </li>
        ))}
      </ol>
    </article>
  );
}
