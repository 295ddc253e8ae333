// What the technician sees for each kind of step: big answers, a reading with its unit (and the
// step's calculator inline), a Try's two outcomes, a Finding's checklist, a Hand-off's message.
import { lazy, Suspense, useState } from 'react';
import { Link } from 'react-router';
import { describeBand } from '@/shared/guides/bands';
import type { Step } from '@/shared/guides/schema';
import type { RoutingAnswer } from '@/shared/walks/answers';
import type { ApplicatorSpecs } from '@/shared/walks/prefill';
import { WITHOUT_CALCULATORS, nextStepFor, type StepCalculators } from '@/shared/walks/walk-path-core';
import { HAZARDS, type Hazard } from '@/shared/tags';
import { unitLabel, unitsFor, type UnitSystem } from '@/shared/units';
import { Button } from '@/components/ui/button';
import { Notice, Skeleton } from '@/components/ui/feedback';
import { inputClass } from '@/components/ui/field';
import { formatValue } from '@/components/calculator/calculator-results';
import type { NewAnswer } from '../hooks/use-walk-runner';

export type Submit = (a: NewAnswer) => Promise<string | null>;

export function CautionGate({ step, unacknowledged, onAcknowledge, busy }: { step: Step; unacknowledged: string[]; onAcknowledge: () => void; busy: boolean }) {
  const open = step.cautions.filter((c) => unacknowledged.includes(c.id));
  if (!open.length) return null;
  return (
    <section aria-label="Cautions" className="space-y-3 rounded-md border-2 border-l-8 border-danger bg-danger-wash p-4">
      {open.map((c) => (
        <div key={c.id}>
          <p className="font-bold text-danger-deep">Caution: {HAZARDS[c.hazard as Hazard] ?? c.hazard}</p>
          <p className="mt-1">{c.text}</p>
          <p className="mt-1 font-semibold">Before you go on: {c.action}</p>
        </div>
      ))}
      <p className="text-sm">Local codes, your site&rsquo;s rules and the equipment maker&rsquo;s manual come first.</p>
      <Button variant="danger" className="w-full !min-h-14 text-lg" busy={busy} onClick={onAcknowledge}>
        I have done this
      </Button>
    </section>
  );
}

export function AskView({ step, disabled, previous, submit }: { step: Extract<Step, { kind: 'ask' }>; disabled: boolean; previous?: RoutingAnswer; submit: Submit }) {
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="space-y-3">
      {step.choices.map((c) => (
        <Button
          key={c.id}
          variant={previous?.kind === 'choice' && previous.choiceId === c.id ? 'primary' : 'secondary'}
          className="w-full !min-h-14 justify-start text-left text-lg"
          disabled={disabled}
          onClick={async () => setError(await submit({ kind: 'choice', stepId: step.id, choiceId: c.id }))}
        >
          {c.label}
        </Button>
      ))}
      {error ? <Notice tone="error" title={error} /> : null}
    </div>
  );
}

export function TryView({ step, disabled, submit }: { step: Extract<Step, { kind: 'try' }>; disabled: boolean; submit: Submit }) {
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="space-y-3">
      <p className="rounded-md bg-paper-sunk p-3 text-lg">{step.action}</p>
      <div className="grid grid-cols-2 gap-3">
        <Button className="!min-h-14 text-lg" disabled={disabled} onClick={async () => setError(await submit({ kind: 'try', stepId: step.id, fixed: true }))}>
          Fixed
        </Button>
        <Button variant="secondary" className="!min-h-14 text-lg" disabled={disabled} onClick={async () => setError(await submit({ kind: 'try', stepId: step.id, fixed: false }))}>
          Not fixed
        </Button>
      </div>
      {error ? <Notice tone="error" title={error} /> : null}
    </div>
  );
}

/** Where a reading would go. A step with a calculator needs `calculators` (its form has them loaded). */
export function BandPreview({ step, answer, calculators = WITHOUT_CALCULATORS }: { step: Extract<Step, { kind: 'measure' }>; answer: RoutingAnswer | null; calculators?: StepCalculators }) {
  if (!answer) return null;
  const r = nextStepFor(calculators, step as Step, answer);
  if (!r.ok) return <p className="text-sm font-semibold text-danger">{r.message}</p>;
  const band = step.bands.find((b) => b.id === r.bandId);
  return (
    <div className="rounded-md border-l-4 border-amber bg-amber-wash px-3 py-2" aria-live="polite" data-band={band?.id}>
      <p className="text-sm text-ink-soft">{r.routedValue ? `${formatValue(r.routedValue.value)} ${unitLabel(r.routedValue.unit)}` : ''} falls in</p>
      <p className="text-lg font-semibold">{band?.label}</p>
      {band ? <p className="text-sm text-ink-soft">{describeBand(band, step.bandUnit)}</p> : null}
    </div>
  );
}

// The calculator form (and the calculators) are only needed on Measure steps that use one, so
// they load when first needed.
const MeasureWithCalculator = lazy(() => import('./measure-with-calculator').then((m) => ({ default: m.MeasureWithCalculator })));

export function MeasureView({ step, disabled, system, submit, specs }: { step: Extract<Step, { kind: 'measure' }>; disabled: boolean; system: UnitSystem; submit: Submit; specs?: ApplicatorSpecs }) {
  return step.calculator ? (
    <Suspense fallback={<Skeleton className="h-48 w-full" />}>
      <MeasureWithCalculator step={step} disabled={disabled} system={system} submit={submit} specs={specs} />
    </Suspense>
  ) : (
    <PlainMeasure step={step} disabled={disabled} system={system} submit={submit} />
  );
}

export function PlainMeasure({
  step,
  disabled,
  system,
  submit,
  calculators,
}: {
  step: Extract<Step, { kind: 'measure' }>;
  disabled: boolean;
  system: UnitSystem;
  submit: Submit;
  calculators?: StepCalculators;
}) {
  const units = unitsFor(step.reading.kind, system);
  const [text, setText] = useState('');
  const [unit, setUnit] = useState(units.includes(step.reading.unit) && system === 'metric' ? step.reading.unit : units[0]);
  const [error, setError] = useState<string | null>(null);
  const value = Number(text.replace(',', '.'));
  const tentative: RoutingAnswer | null = text.trim() && Number.isFinite(value) ? { kind: 'reading', stepId: step.id, id: 'preview-0000', answeredAt: new Date().toISOString(), value, unit } : null;
  return (
    <div className="space-y-3">
      <label className="block text-sm font-semibold" htmlFor={`reading-${step.id}`}>
        {step.reading.label || 'Reading'}
      </label>
      <div className="flex gap-2">
        <input
          id={`reading-${step.id}`}
          className={`${inputClass} tabular !min-h-14 text-2xl`}
          inputMode="decimal"
          autoComplete="off"
          value={text}
          onChange={(e) => setText(e.target.value)}
          disabled={disabled}
        />
        <select aria-label="Unit" className={`${inputClass} w-auto !min-h-14`} value={unit} onChange={(e) => setUnit(e.target.value)} disabled={disabled}>
          {units.map((u) => (
            <option key={u} value={u}>
              {unitLabel(u, step.reading.kind)}
            </option>
          ))}
        </select>
      </div>
      <BandPreview step={step} answer={tentative} calculators={calculators} />
      {error ? <Notice tone="error" title={error} /> : null}
      <Button className="w-full !min-h-14 text-lg" disabled={disabled || !tentative} onClick={async () => setError(await submit({ kind: 'reading', stepId: step.id, value, unit }))}>
        Use this reading
      </Button>
    </div>
  );
}

export function FindingView({ step, disabled, causes, submit }: { step: Extract<Step, { kind: 'finding' }>; disabled: boolean; causes: { code: string; label: string }[]; submit: Submit }) {
  const [ticked, setTicked] = useState<number[]>([]);
  const [other, setOther] = useState(false);
  const [note, setNote] = useState('');
  const [cause, setCause] = useState('');
  const [error, setError] = useState<string | null>(null);
  const send = async (outcome: 'fixed' | 'not-fixed' | 'fixed-by-other') =>
    setError(await submit({ kind: 'finding-outcome', stepId: step.id, outcome, ...(note.trim() ? { note: note.trim() } : {}), ...(outcome === 'fixed-by-other' ? { causeCode: cause } : {}) }));
  return (
    <div className="space-y-4">
      <div className="rounded-md border-2 border-fixed bg-fixed-wash p-3">
        <p className="text-sm font-semibold text-fixed">Probable cause</p>
        <p className="text-lg">{step.cause}</p>
      </div>
      <fieldset>
        <legend className="mb-2 font-semibold">Remedy</legend>
        <ol className="space-y-2">
          {step.remedy.map((r, i) => (
            <li key={i}>
              <label className="flex min-h-11 cursor-pointer items-start gap-3 rounded-md border border-rule bg-paper-raised p-2">
                <input
                  type="checkbox"
                  className="mt-1 size-6 accent-[#1E6B3B]"
                  checked={ticked.includes(i)}
                  onChange={() => setTicked((t) => (t.includes(i) ? t.filter((x) => x !== i) : [...t, i]))}
                />
                <span className={ticked.includes(i) ? 'text-ink-soft line-through' : ''}>
                  {i + 1}. {r}
                </span>
              </label>
            </li>
          ))}
        </ol>
      </fieldset>
      {step.parts.length ? (
        <div>
          <p className="font-semibold">Parts to have ready</p>
          <ul className="mt-1 list-disc pl-5">
            {step.parts.map((p, i) => (
              <li key={i}>
                {p.quantity} × {p.name}
                {p.partNumber ? ` (${p.partNumber})` : ''}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {step.typicalMinutes ? <p className="text-sm text-ink-soft">Usually takes about {step.typicalMinutes} minutes.</p> : null}
      <label className="block">
        <span className="mb-1 block text-sm font-semibold">What you did (optional)</span>
        <textarea className={inputClass} rows={2} value={note} onChange={(e) => setNote(e.target.value)} disabled={disabled} />
      </label>
      <p className="font-semibold">Did it fix the fault?</p>
      <div className="grid gap-2 sm:grid-cols-3">
        <Button className="!min-h-14 text-lg" disabled={disabled} onClick={() => void send('fixed')}>
          Fixed
        </Button>
        <Button variant="secondary" className="!min-h-14" disabled={disabled} onClick={() => void send('not-fixed')}>
          Not fixed
        </Button>
        <Button variant="secondary" className="!min-h-14" disabled={disabled} onClick={() => setOther(true)} aria-expanded={other}>
          Fixed by something else
        </Button>
      </div>
      {other ? (
        <div className="space-y-2 rounded-md border border-rule p-3">
          <label className="block">
            <span className="mb-1 block text-sm font-semibold">What was it really?</span>
            <select className={inputClass} value={cause} onChange={(e) => setCause(e.target.value)}>
              <option value="">— choose the cause —</option>
              {causes.map((c) => (
                <option key={c.code} value={c.code}>
                  {c.label}
                </option>
              ))}
            </select>
          </label>
          <p className="text-sm text-ink-soft">Say in the note above what you did.</p>
          <Button disabled={disabled || !cause || !note.trim()} onClick={() => void send('fixed-by-other')}>
            Record it
          </Button>
        </div>
      ) : null}
      {error ? <Notice tone="error" title={error} /> : null}
    </div>
  );
}

export function HandoffView({ step, walkId }: { step: Extract<Step, { kind: 'handoff' }>; walkId: number }) {
  return (
    <div className="space-y-3">
      <div className="rounded-md border-2 border-ink-soft bg-paper-sunk p-3">
        <p className="text-sm font-semibold text-ink-soft">Call</p>
        <p className="text-lg font-semibold">{step.contact}</p>
        <p className="mt-2 text-sm font-semibold text-ink-soft">Tell them</p>
        <p>{step.message}</p>
      </div>
      <Link to={`/walks/${walkId}/summary`} className="inline-flex min-h-14 w-full items-center justify-center rounded-md bg-amber px-4 text-lg font-semibold text-white">
        Summary to send
      </Link>
    </div>
  );
}
