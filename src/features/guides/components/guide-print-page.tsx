// A published guide on paper, for the binder at the line: every step in outline order with its
// kind, question and answers or reading bands, cautions in full, findings with cause and fix, and
// where each answer leads. Prints on A4 and US Letter alike (see the print rules in styles.css).
import { Link, useParams } from 'react-router';
import { STEP_KIND_LABELS, type DraftStep } from '@/shared/guides';
import { describeBand } from '@/shared/guides/bands';
import { HAZARDS, type Hazard } from '@/shared/tags';
import { unitLabel } from '@/shared/units';
import { ApiError, errorMessage } from '@/lib/api-client';
import { formatDate, formatInteger } from '@/lib/format';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { Button } from '@/components/ui/button';
import { NotFoundPage } from '@/components/errors/route-error';
import { useCauses, useGuide } from '../api/guides';
import { outlineRows } from '../utils/outline';

export function GuidePrintPage() {
  const id = Number(useParams().id);
  const guide = useGuide(id);
  const causes = useCauses();
  if (guide.isPending) return <LoadingBlock label="Loading the guide" />;
  if (guide.isError) {
    if (guide.error instanceof ApiError && guide.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The guide could not be loaded">
        {errorMessage(guide.error)}
      </Notice>
    );
  }
  const g = guide.data;
  const v = g.published;
  if (!v) {
    return (
      <div className="mx-auto max-w-3xl space-y-3">
        <Notice tone="info" title="This guide has no published version to print yet">
          Only published versions are printed, so the binder never holds a step that was not reviewed.
        </Notice>
        <Link to={`/guides/${g.id}`} className="font-semibold text-amber-deep underline">
          Back to the guide
        </Link>
      </div>
    );
  }

  const content = v.content;
  const byId = new Map(content.steps.map((s) => [s.id, s]));
  const { rows, unconnected } = outlineRows(content, new Set());
  const order = [...rows.filter((r) => !r.repeat).map((r) => r.stepId), ...unconnected];
  const number = new Map(order.map((sid, i) => [sid, i + 1]));
  const causeLabel = new Map((causes.data ?? []).map((c) => [c.code, c.label]));
  const to = (next: string | null | undefined) => {
    if (!next) return 'the walk ends';
    const n = number.get(next);
    const s = byId.get(next);
    return n ? `go to step ${n}${s?.title ? ` (${s.title})` : ''}` : 'the walk ends';
  };

  return (
    <article className="guide-print mx-auto max-w-3xl" aria-labelledby="print-title">
      <div className="no-print mb-4 flex flex-wrap items-center gap-3">
        <Link to={`/guides/${g.id}`} className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          Back to the guide
        </Link>
        <Button onClick={() => window.print()}>Print</Button>
        <p className="text-sm text-ink-soft">Fits A4 and US Letter; each step stays on one page.</p>
      </div>

      {/* Not a <header>: the print rules hide the app's header element. */}
      <div className="print-head border-b-2 border-ink pb-3">
        <p className="font-semibold text-amber-deep">{v.meta.symptom}</p>
        <h1 id="print-title" className="text-3xl font-semibold">
          {v.meta.title}
        </h1>
        {v.meta.summary ? <p className="mt-1 text-ink-soft">{v.meta.summary}</p> : null}
        <p className="mt-2 text-sm" data-testid="print-version">
          Version {v.number}
          {v.publishedAt ? `, published ${formatDate(v.publishedAt)}` : ''} · {formatInteger(order.length)} steps · printed {formatDate(new Date())}
        </p>
      </div>

      <p className="print-safety mt-3 rounded-md border-2 border-danger p-3 text-sm font-semibold text-danger-deep" role="note">
        Safety: this guide supports trained people and does not replace them. Follow local codes, your site&rsquo;s rules, the equipment maker&rsquo;s manual and the fluid&rsquo;s safety data sheet.
        Lock out and tag out every energy source and relieve air and fluid pressure before opening a valve. A paper copy can be out of date: check the version against Beadpath.
      </p>

      <ol className="mt-4 space-y-3" aria-label="Steps in outline order">
        {order.map((sid) => {
          const s = byId.get(sid);
          return s ? <PrintStep key={sid} step={s} n={number.get(sid)!} to={to} causeLabel={causeLabel} loose={unconnected.includes(sid)} /> : null;
        })}
      </ol>
    </article>
  );
}

function PrintStep({ step, n, to, causeLabel, loose }: { step: DraftStep; n: number; to: (next: string | null | undefined) => string; causeLabel: Map<string, string>; loose: boolean }) {
  return (
    <li className="print-step rounded-md border border-rule-strong bg-paper-raised p-3" data-print-step={step.id}>
      <p className="text-sm font-semibold text-ink-soft">
        Step {n} · <span data-kind>{STEP_KIND_LABELS[step.kind]}</span>
        {loose ? ' · not reached from the start' : ''}
      </p>
      <h2 className="text-lg font-semibold leading-snug">{step.title}</h2>

      {step.cautions.length ? (
        <ul className="mt-2 space-y-1" aria-label="Cautions">
          {step.cautions.map((c) => (
            <li key={c.id} className="rounded border-l-4 border-danger bg-danger-wash p-2 text-sm">
              <p className="font-semibold text-danger-deep">Caution: {HAZARDS[c.hazard as Hazard] ?? c.hazard}</p>
              <p>{c.text}</p>
              <p className="font-semibold">{c.action}</p>
            </li>
          ))}
        </ul>
      ) : null}

      {step.body?.html ? <div className="prose-bp mt-2" dangerouslySetInnerHTML={{ __html: step.body.html }} /> : null}

      {step.kind === 'ask' ? (
        <ul className="mt-2 list-disc pl-6 text-sm" aria-label="Answers">
          {step.choices.map((c) => (
            <li key={c.id}>
              <span className="font-semibold">{c.label}</span>: {to(c.next)}
            </li>
          ))}
        </ul>
      ) : null}

      {step.kind === 'measure' ? (
        <div className="mt-2 text-sm">
          <p>
            Reading: <span className="font-semibold">{step.reading.label}</span> in {unitLabel(step.reading.unit)}
            {step.calculator ? `, worked through the ${step.calculator.id} calculator (${step.calculator.output})` : ''}
          </p>
          <ul className="mt-1 list-disc pl-6" aria-label="Bands">
            {step.bands.map((b) => (
              <li key={b.id}>
                <span className="font-semibold">{b.label}</span> ({describeBand(b, step.bandUnit)}): {to(b.next)}
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      {step.kind === 'try' ? (
        <div className="mt-2 text-sm">
          <p>
            <span className="font-semibold">Try:</span> {step.action}
          </p>
          <ul className="mt-1 list-disc pl-6">
            <li>
              <span className="font-semibold">Fixed</span>: {step.fixedNext ? to(step.fixedNext) : 'the walk ends, fixed'}
            </li>
            <li>
              <span className="font-semibold">Not fixed</span>: {to(step.notFixedNext)}
            </li>
          </ul>
        </div>
      ) : null}

      {step.kind === 'finding' ? (
        <div className="mt-2 space-y-1 text-sm">
          <p>
            <span className="font-semibold">Cause:</span> {step.cause}
            {step.causeCode ? <span className="text-ink-soft"> ({causeLabel.get(step.causeCode) ?? step.causeCode})</span> : null}
          </p>
          <p className="font-semibold">Fix:</p>
          <ol className="list-decimal pl-6">
            {step.remedy.map((r, i) => (
              <li key={i}>{r}</li>
            ))}
          </ol>
          {step.parts.length ? (
            <p>
              <span className="font-semibold">Parts:</span> {step.parts.map((p) => `${formatInteger(p.quantity)} × ${p.name}${p.partNumber ? ` (${p.partNumber})` : ''}`).join('; ')}
            </p>
          ) : null}
          {step.typicalMinutes ? (
            <p>
              <span className="font-semibold">Typical time:</span> {formatInteger(step.typicalMinutes)} min
            </p>
          ) : null}
        </div>
      ) : null}

      {step.kind === 'handoff' ? (
        <div className="mt-2 text-sm">
          <p>
            <span className="font-semibold">Call:</span> {step.contact}
          </p>
          <p>
            <span className="font-semibold">Tell them:</span> {step.message}
          </p>
        </div>
      ) : null}
    </li>
  );
}
