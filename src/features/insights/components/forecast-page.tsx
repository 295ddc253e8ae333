// The service forecast: which valves reach their seat, needle or seal interval in the next 30, 60
// or 90 days, by the same counters and rates as each applicator's page, and the parts to order.
import { Link, useSearchParams } from 'react-router';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { buttonClass } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { useFilterChoices, useForecast, forecastCsvHref } from '../api/insights';
import { downloadCsv, millions, num } from '../utils/csv';
import { DataTable } from './figure';

const PART_LABELS = { seat: 'Seat', needle: 'Needle', seals: 'Seals' } as const;

export function ForecastPage() {
  const [params, setParams] = useSearchParams();
  const p = { days: params.get('days') ?? '90', siteId: params.get('siteId') ?? undefined };
  const forecast = useForecast(p);
  const choices = useFilterChoices();
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };
  const d = forecast.data;
  // Weeks ahead as a simple calendar: how many services fall in each, so the work can be spread.
  const weeks = d
    ? Array.from({ length: Math.ceil(d.days / 7) }, (_, i) => {
        const start = new Date(Date.parse(`${d.today}T00:00:00Z`) + i * 7 * 86_400_000).toISOString().slice(0, 10);
        const end = new Date(Date.parse(`${d.today}T00:00:00Z`) + (i * 7 + 6) * 86_400_000).toISOString().slice(0, 10);
        return { start, end, rows: d.rows.filter((r) => r.dueOn >= start && r.dueOn <= end) };
      })
    : [];

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end gap-3">
        <SelectField label="Due within" value={p.days} onChange={(e) => set('days', e.target.value)}>
          <option value="30">30 days</option>
          <option value="60">60 days</option>
          <option value="90">90 days</option>
        </SelectField>
        <SelectField label="Site" value={p.siteId ?? ''} onChange={(e) => set('siteId', e.target.value)}>
          <option value="">All sites</option>
          {choices.data?.sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
        </SelectField>
        <a className={buttonClass('secondary')} href={forecastCsvHref(p)} download>
          Download CSV
        </a>
      </div>
      {forecast.isError ? <Notice tone="error" title="The forecast could not be loaded">{errorMessage(forecast.error)}</Notice> : null}
      {forecast.isPending ? <LoadingBlock label="Loading the forecast" /> : null}
      {d ? (
        <>
          <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5" data-testid="forecast-table">
            <h2 className="font-serif text-lg font-semibold">Services due in the next {d.days} days</h2>
            <p className="mb-2 text-sm text-ink-soft">
              From each running applicator’s counter readings (or its expected rate when readings are stale) against its own interval or the common-practice default. Overdue parts show as due today.
            </p>
            {d.rows.length === 0 ? (
              <p>No seat, needle or seal service falls due in the next {d.days} days.</p>
            ) : (
              <div className="overflow-x-auto">
                <table className="w-full text-left text-sm">
                  <caption className="sr-only">Services due in the next {d.days} days</caption>
                  <thead>
                    <tr className="border-b border-rule-strong">
                      {['Applicator', 'Site / line', 'Part', 'Due', 'Cycles since / interval', 'Parts'].map((h) => (
                        <th key={h} scope="col" className="px-2 py-2 font-semibold">{h}</th>
                      ))}
                    </tr>
                  </thead>
                  <tbody>
                    {d.rows.map((r) => (
                      <tr key={`${r.applicatorId}-${r.part}`} className="border-b border-rule align-top">
                        <td className="px-2 py-2"><Link className="font-semibold text-amber-deep underline" to={`/applicators/${r.applicatorId}`}>{r.tag}</Link></td>
                        <td className="px-2 py-2">{r.site} / {r.line}</td>
                        <td className="px-2 py-2">{PART_LABELS[r.part]}</td>
                        <td className="px-2 py-2 tabular-nums">{r.status === 'overdue' ? <span className="font-semibold text-danger">Overdue</span> : `${r.dueOn} (${r.daysRemaining} d)`}</td>
                        <td className="px-2 py-2 tabular-nums">{millions(r.cyclesSince)} / {millions(r.threshold)}</td>
                        <td className="px-2 py-2">{r.partsKnown ? r.parts.map((x) => `${x.quantity} × ${x.name}${x.partNumber ? ` (${x.partNumber})` : ''}`).join('; ') : <span className="text-ink-soft">None known: no earlier service of this kind on it listed parts</span>}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </section>

          {d.rows.length ? (
            <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5">
              <h2 className="font-serif text-lg font-semibold">Calendar by week</h2>
              <ol className="mt-2 grid gap-2 sm:grid-cols-2 lg:grid-cols-4">
                {weeks.map((w) => (
                  <li key={w.start} className={`rounded border p-2 text-sm ${w.rows.length ? 'border-amber-line bg-amber-wash' : 'border-rule'}`}>
                    <p className="font-semibold">{w.start} – {w.end}</p>
                    <p>{w.rows.length ? w.rows.map((r) => `${r.tag} ${PART_LABELS[r.part].toLowerCase()}`).join(', ') : 'Nothing due'}</p>
                  </li>
                ))}
              </ol>
            </section>
          ) : null}

          <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <h2 className="font-serif text-lg font-semibold">Parts to order</h2>
              {d.partsToOrder.length ? (
                <button
                  type="button"
                  className={buttonClass('secondary')}
                  onClick={() => downloadCsv(`parts-to-order-${d.today}-${d.days}d.csv`, ['Part number', 'Part', 'Quantity', 'Applicators'], d.partsToOrder.map((x) => [x.partNumber, x.name, x.quantity, x.applicators]))}
                >
                  Download CSV
                </button>
              ) : null}
            </div>
            <p className="mb-2 text-sm text-ink-soft">Summed by part number from the parts used the last time each applicator had the same service.</p>
            {d.partsToOrder.length ? (
              <DataTable caption="Parts to order" header={['Part number', 'Part', 'Quantity', 'Applicators']} rows={d.partsToOrder.map((x) => [x.partNumber ?? '—', x.name, num(x.quantity), x.applicators])} />
            ) : (
              <p>{d.rows.length ? 'None known: earlier services of these kinds recorded no parts.' : 'Nothing is due, so nothing to order.'}</p>
            )}
            {d.partsUnknown > 0 && d.partsToOrder.length ? <p className="mt-2 text-sm">{d.partsUnknown} of the services due have no known parts and are not in these sums.</p> : null}
          </section>

          {d.noForecast.length ? (
            <details className="rounded-lg border border-rule bg-paper-raised p-4">
              <summary className="cursor-pointer font-semibold">{d.noForecast.length} running {d.noForecast.length === 1 ? 'applicator' : 'applicators'} cannot be forecast</summary>
              <ul className="mt-2 list-disc pl-5 text-sm">
                {d.noForecast.slice(0, 100).map((n) => (
                  <li key={n.applicatorId}><Link className="underline" to={`/applicators/${n.applicatorId}`}>{n.tag}</Link>: {n.reason}</li>
                ))}
              </ul>
            </details>
          ) : null}
          {d.rows.length === 0 && d.noForecast.length === 0 ? <EmptyState title="Nothing to forecast">There are no running applicators{p.siteId ? ' on this site' : ''}.</EmptyState> : null}
        </>
      ) : null}
    </div>
  );
}
