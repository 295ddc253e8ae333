// One applicator, phone first: what a scanned label opens. Start a walk in one tap, record a
// service or a counter reading, see when the seat, needle and seals are due, then the counter,
// the history, the walks and the specs.
import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router';
import {
  ACTUATION_LABELS,
  COIL_DRIVE_LABELS,
  NEEDLE_TIP_LABELS,
  SERVICE_ACTION_LABELS,
  localToday,
  type ApplicatorDetail,
  type CustomValue,
  type FieldView,
  type ForecastView,
} from '@/shared/schemas/assets';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useCan, useMe } from '@/lib/auth';
import { useTags } from '@/lib/tags';
import { showToast } from '@/lib/toasts';
import { Button, ButtonLink } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { Card } from '@/components/ui/page';
import { Icon } from '@/components/ui/icons';
import { NotFoundPage } from '@/components/errors/route-error';
import { useAddReading, useApplicator, useRemoveReading, useRemoveServiceEvent, useWalkableGuides } from '../api/assets';
import { cycles, days, exactCycles, longDate, withUnit } from '../utils/format';
import { CounterChart } from './counter-chart';
import { StatusChip } from './status-chip';
import { formatInteger, formatNumber } from '@/lib/format';

const PART_WORDS = { seat: 'Seat', needle: 'Needle', seals: 'Seals' } as const;

export function ApplicatorPage() {
  const id = Number(useParams().id);
  const q = useApplicator(Number.isInteger(id) ? id : 0);
  if (!Number.isInteger(id) || id <= 0) return <NotFoundPage />;
  if (q.isPending) return <LoadingBlock label="Opening the applicator" />;
  if (q.isError) {
    if (q.error instanceof ApiError && q.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="This applicator could not be opened">
        {errorMessage(q.error)}
      </Notice>
    );
  }
  return <Applicator a={q.data} />;
}

function Applicator({ a }: { a: ApplicatorDetail }) {
  const canRecord = useCan('assets:record');
  const canManage = useCan('assets:manage');
  const canWalk = useCan('walks:run');
  const [readingOpen, setReadingOpen] = useState(false);
  return (
    <div className="mx-auto max-w-3xl pb-8 lg:max-w-6xl">
      <div className="mb-5">
        <Link to=".." relative="path" className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
          ← All applicators
        </Link>
        <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
          <h1 className="text-3xl font-semibold">{a.tag}</h1>
          <StatusChip status={a.status} />
        </div>
        <p className="text-lg">
          {a.siteName} · {a.lineName}
        </p>
        <p className="text-ink-soft">
          {ACTUATION_LABELS[a.actuation]}
          {a.fluidName ? ` · ${a.fluidName}` : ''}
          {a.heated && a.setTemperatureC !== null ? ` · heated to ${a.setTemperatureC} °C` : ''}
        </p>
      </div>
      <div className="lg:grid lg:grid-cols-[minmax(0,1fr)_22rem] lg:gap-x-8">
        <div className="space-y-5">
          {a.status === 'retired' ? (
            <Notice tone="info" title="This applicator is retired">
              Its history is kept; new walks and services are usually recorded on the valve that replaced it.
            </Notice>
          ) : null}
          {canWalk ? <StartWalk a={a} /> : null}
          {canRecord ? (
            <div className="grid gap-2 sm:grid-cols-2">
              <ButtonLink to="service/new" className="!min-h-14 text-lg">
                Record service
              </ButtonLink>
              <Button variant="secondary" className="!min-h-14 text-lg" onClick={() => setReadingOpen(true)}>
                Add counter reading
              </Button>
            </div>
          ) : null}
          <Forecasts a={a} />
          {a.forecasts.some((f) => f.status === 'overdue' || (f.daysRemaining !== null && f.daysRemaining <= 30)) ? <ServiceCaution a={a} /> : null}
          <Counter a={a} canManage={canManage} />
          <History a={a} canManage={canManage} />
        </div>
        <div className="mt-5 space-y-5 lg:mt-0">
          <Walks a={a} />
          <Specs a={a} />
          {canManage ? (
            <div className="flex flex-wrap gap-2 border-t border-rule pt-4">
              <ButtonLink to="edit" variant="secondary">
                Edit specs
              </ButtonLink>
              <ButtonLink to={`/applicators/labels?ids=${a.id}`} variant="secondary">
                Print its label
              </ButtonLink>
            </div>
          ) : null}
        </div>
      </div>

      <ReadingDialog a={a} open={readingOpen} onClose={() => setReadingOpen(false)} />
    </div>
  );
}

function StartWalk({ a }: { a: ApplicatorDetail }) {
  const guides = useWalkableGuides();
  const tags = useTags();
  const [all, setAll] = useState(false);
  // Guides written only for the other kind of valve, or only for other fluids, go behind "more",
  // so the likely symptoms fit on a phone screen.
  const other = a.actuation === 'electric' ? 'air-operated' : 'electric';
  const fluids = new Set((tags.data ?? []).filter((t) => t.group === 'fluid').map((t) => t.slug));
  const fits = (g: { tags: string[] }) => {
    if (g.tags.includes(other) && !g.tags.includes(a.actuation)) return false;
    const forFluids = g.tags.filter((t) => fluids.has(t));
    return !a.fluidFamily || forFluids.length === 0 || forFluids.includes(a.fluidFamily);
  };
  const list = guides.data ?? [];
  const likely = list.filter(fits);
  const shown = all ? list : likely;
  return (
    <section aria-labelledby="start-walk" className="rounded-lg border-2 border-amber-line bg-amber-wash/40 p-4">
      <h2 id="start-walk" className="text-xl font-semibold">
        Start a walk: what are you seeing?
      </h2>
      <p className="mb-3 text-sm text-ink-soft">Tap the symptom. The walk is recorded on {a.tag}.</p>
      {guides.isPending ? (
        <LoadingBlock label="Loading symptoms" />
      ) : guides.isError ? (
        <p className="text-sm">The symptoms could not be loaded: {errorMessage(guides.error)}</p>
      ) : list.length === 0 ? (
        <p className="text-sm">No guide has been published yet.</p>
      ) : (
        <>
          <ul className="flex flex-wrap gap-2">
            {shown.map((g) => (
              <li key={g.id}>
                <Link
                  to={`/guides/${g.id}/walk?applicatorId=${a.id}`}
                  className="inline-flex min-h-14 items-center rounded-2xl border-2 border-amber-line bg-paper-raised px-4 py-1 text-lg font-semibold leading-snug hover:bg-amber-wash"
                >
                  {g.symptom}
                </Link>
              </li>
            ))}
          </ul>
          {likely.length < list.length ? (
            <Button variant="quiet" className="mt-1" aria-expanded={all} onClick={() => setAll((x) => !x)}>
              {all ? 'Fewer symptoms' : `More symptoms (${list.length - likely.length})`}
            </Button>
          ) : null}
        </>
      )}
    </section>
  );
}

/** Days while they are countable on a calendar, then months, then years. */
function span(d: number): string {
  if (d <= 60) return days(d);
  if (d <= 730) return `${formatInteger(d / 30.44)} months`;
  return `${formatNumber(d / 365.25, { maximumFractionDigits: d > 3650 ? 0 : 1 })} years`;
}

function forecastWords(f: ForecastView): { head: string; tone: string } {
  if (f.status === 'overdue') return { head: 'Due now', tone: 'border-amber bg-amber-wash' };
  if (f.status === 'no-forecast' || f.daysRemaining === null) return { head: 'No forecast yet', tone: 'border-rule bg-paper-raised' };
  const soon = f.daysRemaining <= 30;
  return { head: `In about ${span(f.daysRemaining)}`, tone: soon ? 'border-amber bg-amber-wash' : 'border-rule bg-paper-raised' };
}

function Forecasts({ a }: { a: ApplicatorDetail }) {
  const common = a.forecasts.some((f) => f.thresholdSource === 'common-practice');
  return (
    <section aria-labelledby="forecasts">
      <h2 id="forecasts" className="mb-2 text-xl font-semibold">
        Next service
      </h2>
      <ul className={`grid gap-2 ${a.forecasts.length === 3 ? 'sm:grid-cols-3' : 'sm:grid-cols-2'}`}>
        {a.forecasts.map((f) => {
          const w = forecastWords(f);
          const share = f.cyclesSince !== null ? Math.min(1, f.cyclesSince / f.threshold) : 0;
          return (
            <li key={f.part} className={`rounded-lg border-2 p-3 ${w.tone}`} data-forecast={f.part}>
              <p className="text-sm font-semibold text-ink-soft">{PART_WORDS[f.part]}</p>
              <p className="text-lg font-semibold">{w.head}</p>
              {f.dueOn && f.status === 'ok' ? <p className="text-sm">around {longDate(f.dueOn)}</p> : null}
              <div className="mt-2 h-2 overflow-hidden rounded-full bg-paper-sunk" aria-hidden>
                <div className="h-full bg-amber" style={{ width: `${share * 100}%` }} />
              </div>
              <p className="tabular mt-1 text-sm">{f.cyclesSince !== null ? `${cycles(f.cyclesSince)} of ${cycles(f.threshold)}` : `Interval ${cycles(f.threshold)}`}</p>
              <p className="text-sm text-ink-soft">
                {f.since ? `since ${f.part === 'seals' ? 'they were' : 'it was'} replaced on ${longDate(f.since)}` : 'since installation'}
                {f.thresholdSource === 'common-practice' ? ' · common-practice interval' : ' · your organisation’s interval'}
              </p>
            </li>
          );
        })}
      </ul>
      <p className="mt-2 text-sm text-ink-soft">
        {a.counter.rateSource === 'readings'
          ? `Forecast from the counter readings: about ${cycles(a.counter.cyclesPerDay)} a day.`
          : a.counter.rateSource === 'expected'
            ? `No recent counter reading, so the forecast uses the expected rate: about ${cycles(a.counter.cyclesPerDay)} a day.`
            : 'Add counter readings or an expected rate to get a forecast.'}{' '}
        {common
          ? 'Common-practice intervals are trade rules of thumb for a carbide needle on a stainless seat (seat about 100 million cycles, needle about 500 million, air-valve seals about half the seat’s). The valve maker’s intervals and your site’s plan come first.'
          : 'The valve maker’s intervals and your site’s plan come first.'}
      </p>
    </section>
  );
}

export function ServiceCaution({ a }: { a: Pick<ApplicatorDetail, 'tag' | 'heated' | 'actuation'> }) {
  return (
    <aside className="rounded-md border-2 border-l-8 border-danger bg-danger-wash px-4 py-3" aria-label="Caution">
      <p className="flex items-center gap-2 font-bold text-danger-deep">
        <Icon.warning /> Before servicing {a.tag}
      </p>
      <p className="text-sm">
        Lock out and tag out every energy source{a.actuation === 'electric' ? ' (including the coil driver, which may run at high voltage)' : ' (including the air supply)'}, then relieve air and fluid
        pressure before opening anything.
        {a.heated ? ' The valve is heated: let it cool or wear heat-rated gloves.' : ''} Fluid under pressure can inject through skin: treat any injection as a medical emergency. Follow your site’s
        rules, the valve maker’s manual and the fluid’s safety data sheet.
      </p>
    </aside>
  );
}

function Counter({ a, canManage }: { a: ApplicatorDetail; canManage: boolean }) {
  const remove = useRemoveReading(a.id);
  const c = a.counter;
  return (
    <Card>
      <h2 className="text-xl font-semibold">Cycle counter</h2>
      {c.lastCount === null ? (
        <p className="mt-2 text-ink-soft">No reading yet. Read the count on the valve’s controller and add it here.</p>
      ) : (
        <dl className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-3">
          <div>
            <dt className="text-sm text-ink-soft">Last reading</dt>
            <dd className="tabular font-semibold">{exactCycles(c.lastCount)}</dd>
            <dd className="text-sm">{longDate(c.lastReadingOn)}</dd>
          </div>
          <div>
            <dt className="text-sm text-ink-soft">{c.estimated ? 'Estimated today (lifetime)' : 'Lifetime today'}</dt>
            <dd className="tabular font-semibold">{cycles(c.estimatedLifetime)}</dd>
          </div>
          <div>
            <dt className="text-sm text-ink-soft">Rate</dt>
            <dd className="tabular font-semibold">{c.cyclesPerDay !== null ? `${cycles(c.cyclesPerDay)}/day` : '—'}</dd>
            <dd className="text-sm">{c.rateSource === 'readings' ? 'from readings' : c.rateSource === 'expected' ? 'expected rate' : ''}</dd>
          </div>
        </dl>
      )}
      {c.stale && c.lastCount !== null ? <p className="mt-2 text-sm text-amber-deep">The last reading is more than 30 days old; a fresh one sharpens the forecast.</p> : null}
      <CounterChart readings={a.readings} events={a.serviceEvents} />
      {a.readings.length ? (
        <details className="mt-3">
          <summary className="min-h-11 cursor-pointer font-semibold">All readings ({a.readings.length})</summary>
          <ul className="divide-y divide-rule text-sm">
            {[...a.readings].reverse().map((r) => (
              <li key={r.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <span>
                  <span className="tabular font-semibold">{exactCycles(r.count)}</span> on {longDate(r.readOn)}
                  {r.counterReset ? <span className="ml-2 rounded bg-amber-wash px-1.5 text-amber-deep">counter reset</span> : null}
                  {r.source === 'service' ? <span className="ml-2 text-ink-soft">with a service</span> : r.source === 'csv' ? <span className="ml-2 text-ink-soft">imported</span> : null}
                  {r.note ? <span className="block text-ink-soft">{r.note}</span> : null}
                </span>
                {canManage ? (
                  <Button
                    variant="quiet"
                    className="text-sm"
                    busy={remove.isPending && remove.variables?.sub === r.id}
                    onClick={() =>
                      window.confirm(`Remove the reading of ${exactCycles(r.count)} on ${longDate(r.readOn)}?`) && remove.mutate({ sub: r.id }, { onSuccess: () => showToast('Reading removed', 'ok') })
                    }
                  >
                    Remove
                  </Button>
                ) : null}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </Card>
  );
}

function ReadingDialog({ a, open, onClose }: { a: ApplicatorDetail; open: boolean; onClose: () => void }) {
  const add = useAddReading(a.id);
  const [readOn, setReadOn] = useState(localToday());
  const [count, setCount] = useState('');
  const [reset, setReset] = useState(false);
  const [note, setNote] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  function submit(e: FormEvent) {
    e.preventDefault();
    const n = Number(count.replace(/[\s,_]/g, ''));
    if (!count.trim() || !Number.isFinite(n)) {
      setFields({ count: 'Type the number shown on the counter' });
      return;
    }
    add.mutate(
      { body: { readOn, count: n, counterReset: reset, note: note || null } },
      {
        onSuccess: () => {
          showToast('Counter reading kept', 'ok');
          setCount('');
          setReset(false);
          setNote('');
          setFields({});
          onClose();
        },
        onError: (err) => setFields(err instanceof ApiError ? { ...err.fields, ...(Object.keys(err.fields).length ? {} : { count: err.message }) } : { count: errorMessage(err) }),
      },
    );
  }
  return (
    <Dialog open={open} title={`Counter reading on ${a.tag}`} onClose={onClose}>
      <form onSubmit={submit} className="space-y-4">
        <TextField
          label="Count shown (cycles)"
          inputMode="numeric"
          autoComplete="off"
          value={count}
          onChange={(e) => setCount(e.target.value)}
          error={fields.count}
          hint={a.counter.lastCount !== null ? `Last: ${exactCycles(a.counter.lastCount)} on ${longDate(a.counter.lastReadingOn)}` : undefined}
          autoFocus
        />
        <TextField label="Date read" type="date" value={readOn} max={localToday()} onChange={(e) => setReadOn(e.target.value)} error={fields.readOn} />
        <label className="flex min-h-11 items-start gap-3">
          <input type="checkbox" className="mt-1 size-6" checked={reset} onChange={(e) => setReset(e.target.checked)} />
          <span>
            <span className="font-semibold">Counter reset</span>
            <span className="block text-sm text-ink-soft">The valve or its controller was replaced, so the counter started again.</span>
          </span>
        </label>
        <TextField label="Note (optional)" value={note} onChange={(e) => setNote(e.target.value)} error={fields.note} />
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={add.isPending}>
            Keep reading
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function History({ a, canManage }: { a: ApplicatorDetail; canManage: boolean }) {
  const remove = useRemoveServiceEvent(a.id);
  return (
    <section aria-labelledby="history">
      <h2 id="history" className="mb-2 text-xl font-semibold">
        Service history
      </h2>
      {a.serviceEvents.length === 0 ? (
        <EmptyState title="No service recorded yet">
          <p>Record each seat, needle, seal or coil change here, with the cycle count, so the next one can be planned.</p>
        </EmptyState>
      ) : (
        <ol className="space-y-3" data-testid="service-history">
          {a.serviceEvents.map((e) => (
            <li key={e.id} className="rounded-lg border border-rule bg-paper-raised p-3">
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <p className="font-semibold">{e.actions.map((x) => (x === 'other' && e.otherAction ? e.otherAction : SERVICE_ACTION_LABELS[x])).join(', ')}</p>
                <p className="text-sm text-ink-soft">{longDate(e.performedOn)}</p>
              </div>
              {e.causeLabel ? (
                <p className="text-sm">
                  <span className="text-ink-soft">Cause:</span> {e.causeLabel}
                </p>
              ) : (
                <p className="text-sm text-ink-soft">Planned service</p>
              )}
              {e.parts.length ? (
                <ul className="mt-1 text-sm">
                  {e.parts.map((p, i) => (
                    <li key={i}>
                      {p.quantity} × {p.name}
                      {p.partNumber ? ` (${p.partNumber})` : ''}
                    </li>
                  ))}
                </ul>
              ) : null}
              {e.cycleCount !== null ? <p className="tabular text-sm">At {exactCycles(e.cycleCount)}</p> : null}
              {e.notes ? <p className="mt-1 whitespace-pre-line text-sm">{e.notes}</p> : null}
              {e.files.length ? (
                <div className="mt-2 flex flex-wrap gap-2">
                  {e.files.map((f) =>
                    f.kind === 'photo' ? (
                      <a key={f.id} href={f.urls.large ?? f.urls.display} target="_blank" rel="noreferrer">
                        <img src={f.urls.thumb} alt={`Photo from the service on ${longDate(e.performedOn)}`} className="size-20 rounded object-cover" />
                      </a>
                    ) : (
                      <a key={f.id} href={f.urls.original} className="text-sm font-semibold text-amber-deep underline">
                        {f.originalName}
                      </a>
                    ),
                  )}
                </div>
              ) : null}
              <p className="mt-1 text-sm text-ink-soft">
                {e.performedBy ? `By ${e.performedBy}` : ''}
                {e.walkId ? (
                  <>
                    {e.performedBy ? ' · ' : ''}
                    <Link className="font-semibold text-amber-deep underline" to={`/walks/${e.walkId}/summary`}>
                      the walk that led to it
                    </Link>
                  </>
                ) : null}
              </p>
              {canManage ? (
                <Button
                  variant="quiet"
                  className="text-sm"
                  onClick={() =>
                    window.confirm('Remove this service record? The reading taken with it goes too.') && remove.mutate({ sub: e.id }, { onSuccess: () => showToast('Service record removed', 'ok') })
                  }
                >
                  Remove
                </Button>
              ) : null}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

function Walks({ a }: { a: ApplicatorDetail }) {
  if (!a.walks.length) return null;
  const outcome = (w: ApplicatorDetail['walks'][number]) =>
    w.status === 'open'
      ? 'open'
      : w.status === 'abandoned'
        ? 'stopped'
        : w.outcome === 'fixed'
          ? 'fixed'
          : w.outcome === 'fixed-by-other'
            ? 'fixed by something else'
            : w.outcome === 'not-fixed'
              ? 'not fixed'
              : 'handed off';
  return (
    <section aria-labelledby="walks">
      <h2 id="walks" className="mb-2 text-xl font-semibold">
        Walks on this applicator
      </h2>
      <ul className="divide-y divide-rule rounded-lg border border-rule bg-paper-raised">
        {a.walks.map((w) => (
          <li key={w.id}>
            <Link to={w.status === 'open' ? `/walks/${w.id}` : `/walks/${w.id}/summary`} className="block min-h-11 px-3 py-2 hover:bg-paper-sunk">
              <span className="font-semibold">{w.symptom}</span>
              <span className="block text-sm text-ink-soft">
                {longDate(w.startedAt)} · {w.userName ?? 'someone'} · {outcome(w)}
                {w.causeLabel ? ` · ${w.causeLabel}` : ''}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}

function customText(f: FieldView, v: CustomValue | undefined): string {
  if (v === undefined || v === null || v === '') return '—';
  if (f.type === 'yes-no') return v ? 'Yes' : 'No';
  if (f.type === 'date') return longDate(String(v));
  return f.unit ? `${v} ${f.unit}` : String(v);
}

function Specs({ a }: { a: ApplicatorDetail }) {
  const { data: me } = useMe();
  const tags = useTags();
  const imperial = me?.user.unitSystem === 'imperial';
  const family = a.fluidFamily ? (tags.data?.find((t) => t.group === 'fluid' && t.slug === a.fluidFamily)?.label ?? a.fluidFamily) : null;
  const rows: [string, string][] = [
    ['Actuation', ACTUATION_LABELS[a.actuation]],
    ...(a.actuation === 'electric'
      ? [['Coil drive', a.coilDrive ? COIL_DRIVE_LABELS[a.coilDrive] : '—'] as [string, string]]
      : [['Air pressure', withUnit(a.airPressureBar, 'bar', imperial)] as [string, string]]),
    ['Needle tip', [a.needleTip ? NEEDLE_TIP_LABELS[a.needleTip] : null, a.needleMaterial].filter(Boolean).join(', ') || '—'],
    ['Seat', [a.seatMaterial, a.orificeDiameterMm !== null ? `orifice ${withUnit(a.orificeDiameterMm, 'mm', imperial)}` : null].filter(Boolean).join(', ') || '—'],
    ['Nozzle', a.nozzle ?? '—'],
    ['Fluid', [a.fluidName, family ? `(${family})` : null].filter(Boolean).join(' ') || '—'],
    ['Viscosity', a.viscosityMPas !== null ? `${withUnit(a.viscosityMPas, 'mPa.s', imperial)} at ${withUnit(a.viscosityTemperatureC, 'degC', imperial)}` : '—'],
    ['Density', withUnit(a.densityGPerCm3, 'g/cm3', imperial)],
    ['Heated', a.heated ? `Yes, set to ${withUnit(a.setTemperatureC, 'degC', imperial)}` : 'No'],
    ['Installed', longDate(a.installedOn)],
    ['Expected rate', a.cyclesPerMinute !== null ? `${a.cyclesPerMinute} cycles/min × ${a.hoursPerDay} h/day × ${a.daysPerWeek} days/week` : '—'],
    ...a.fields.map((f) => [f.unit ? `${f.name}` : f.name, customText(f, a.custom[String(f.id)])] as [string, string]),
  ];
  return (
    <Card>
      <h2 className="flex items-center gap-2 text-xl font-semibold">
        <Icon.valve /> Specs
      </h2>
      <dl className="mt-2 divide-y divide-rule">
        {rows.map(([k, v]) => (
          <div key={k} className="grid grid-cols-[8.5rem_1fr] gap-3 py-2 sm:grid-cols-[12rem_1fr] lg:grid-cols-[8rem_1fr]">
            <dt className="text-sm font-semibold text-ink-soft">{k}</dt>
            <dd className="tabular">{v}</dd>
          </div>
        ))}
      </dl>
    </Card>
  );
}
