// The service forecast: which valves reach their seat, needle or seal interval in the next 30, 60
// or 90 days, by the same counters and rates as each applicator's page, as a table and a calendar,
// the parts to order, and the weekly digest's switch. Prints on A4 or US Letter.
import { Link, useSearchParams } from 'react-router';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { Button, buttonClass } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { formatDate, formatDateTime } from '@/lib/format';
import { showToast } from '@/lib/toasts';
import { useDigestPreference, useDigestPreview, useFilterChoices, useForecast, forecastCsvHref, useSetDigest } from '../api/insights';
import { downloadCsv, millions, num } from '../utils/csv';
import { DataTable } from './figure';
import { ForecastCalendar } from './forecast-calendar';
import { Freshness, PrintedAsOf } from './freshness';

// Paper: whatever size the printer has (A4 or US Letter, both fit the narrower A4 width), the
// app's navigation and the page's controls left out, table rows never split, the calendar on a page
// of its own.
const PRINT_CSS = `@media print {
  @page { size: auto; margin: 12mm; }
  html { font-size: 10pt; }
  .forecast-print { color: black; }
  .forecast-print section { border: none !important; padding: 0 !important; background: none !important; }
  .forecast-print .overflow-x-auto { overflow: visible !important; }
  .forecast-print table { width: 100%; border-collapse: collapse; }
  .forecast-print thead { display: table-header-group; }
  .forecast-print tr, .forecast-print li { break-inside: avoid; page-break-inside: avoid; }
  .forecast-print h2 { break-after: avoid; page-break-after: avoid; }
  .forecast-print [data-print="calendar"] { break-before: page; page-break-before: always; break-after: page; page-break-after: always; }
  .forecast-print [data-print="calendar"] td { height: auto; min-height: 0; }
  .forecast-print a { color: inherit; text-decoration: none; }
}`;

function DigestPanel() {
  const pref = useDigestPreference();
  const set = useSetDigest();
  const preview = useDigestPreview();
  const p = pref.data;
  return (
    <section id="digest" className="no-print rounded-lg border border-rule bg-paper-raised p-4 sm:p-5" aria-labelledby="digest-title">
      <h2 id="digest-title" className="font-serif text-lg font-semibold">
        Weekly e-mail digest
      </h2>
      <p className="text-sm text-ink-soft">
        Every Monday at 06:00 UTC, managers get the services due in the coming 7 and 30 days and the repeat failures of the last 30 days, with links here.
        {p?.lastSentAt ? ` Last sent ${formatDateTime(p.lastSentAt)}.` : ''}
      </p>
      {p ? (
        <div className="mt-2 flex flex-wrap items-center gap-3">
          {p.eligible ? (
            <label className="flex min-h-11 items-center gap-2 font-semibold">
              <input
                type="checkbox"
                className="size-5 accent-amber-deep"
                checked={p.enabled}
                disabled={set.isPending}
                onChange={(e) => set.mutate(e.target.checked, { onSuccess: (r) => showToast(r.enabled ? 'You will get the weekly digest.' : 'You will no longer get the weekly digest.', 'ok') })}
              />
              Send me the weekly digest
            </label>
          ) : (
            <p className="text-sm">The weekly digest goes to managers; you can still send yourself a copy.</p>
          )}
          <Button variant="secondary" busy={preview.isPending} onClick={() => preview.mutate(undefined, { onSuccess: (r) => showToast(`A preview is on its way to ${r.to}.`, 'ok') })}>
            Send me a preview now
          </Button>
        </div>
      ) : null}
    </section>
  );
}

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
  const site = choices.data?.sites.find((s) => String(s.id) === p.siteId)?.name;

  return (
    <div className="forecast-print space-y-5">
      <style>{PRINT_CSS}</style>
      <div className="no-print flex flex-wrap items-end gap-3">
        <SelectField label="Due within" value={p.days} onChange={(e) => set('days', e.target.value)}>
          <option value="30">30 days</option>
          <option value="60">60 days</option>
          <option value="90">90 days</option>
        </SelectField>
        <SelectField label="Site" value={p.siteId ?? ''} onChange={(e) => set('siteId', e.target.value)}>
          <option value="">All sites</option>
          {choices.data?.sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </SelectField>
        <a className={buttonClass('secondary')} href={forecastCsvHref(p)} download>
          Download CSV
        </a>
        <Button variant="secondary" onClick={() => window.print()}>
          Print
        </Button>
      </div>
      {forecast.isError ? (
        <Notice tone="error" title="The forecast could not be loaded">
          {errorMessage(forecast.error)}
        </Notice>
      ) : null}
      {forecast.isPending ? <LoadingBlock label="Loading the forecast" /> : null}
      {d ? (
        <>
          <Freshness asOf={d.asOf} />
          <PrintedAsOf asOf={d.asOf} />
          <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5" data-testid="forecast-table">
            <h2 className="font-serif text-lg font-semibold">
              Services due in the next {d.days} days{site ? `, ${site}` : ''}
            </h2>
            <p className="mb-2 text-sm text-ink-soft">
              From each running applicator’s counter readings (or its expected rate when readings are stale) against its own interval, else{' '}
              {d.defaultIntervals.source === 'organisation' ? 'your organisation’s default' : 'the common-practice default'} (seat {millions(d.defaultIntervals.seat)}, needle{' '}
              {millions(d.defaultIntervals.needle)}, seals {millions(d.defaultIntervals.seals)} cycles). Overdue parts show as due today, {formatDate(d.today)}.
            </p>
            {d.rows.length === 0 ? (
              <p>No seat, needle or seal service falls due in the next {d.days} days.</p>
            ) : (
              <>
                {/* Phones: one card per service; the table is for wider screens and paper. */}
                <ul className="divide-y divide-rule sm:hidden print:hidden" aria-label={`Services due in the next ${d.days} days`}>
                  {d.rows.map((r) => (
                    <li key={`${r.applicatorId}-${r.part}`} className="py-3">
                      <p className="flex flex-wrap items-baseline justify-between gap-2">
                        <span>
                          <Link className="font-semibold text-amber-deep underline" to={`/applicators/${r.applicatorId}`}>
                            {r.tag}
                          </Link>{' '}
                          · {PART_LABELS[r.part]}
                        </span>
                        <span className="tabular-nums">{r.status === 'overdue' ? <span className="font-semibold text-danger">Overdue</span> : `${formatDate(r.dueOn)} (${r.daysRemaining} d)`}</span>
                      </p>
                      <p className="text-sm text-ink-soft">
                        {r.site} / {r.line} · {millions(r.cyclesSince)} of {millions(r.threshold)} cycles
                      </p>
                      <p className="text-sm">
                        {r.partsKnown ? (
                          r.parts.map((x) => `${x.quantity} × ${x.name}${x.partNumber ? ` (${x.partNumber})` : ''}`).join('; ')
                        ) : (
                          <span className="text-ink-soft">Parts: none known</span>
                        )}
                      </p>
                    </li>
                  ))}
                </ul>
                <div className="hidden overflow-x-auto sm:block print:block" tabIndex={0} role="region" aria-label={`Services due in the next ${d.days} days, table`}>
                  <table className="w-full text-left text-sm">
                    <caption className="sr-only">Services due in the next {d.days} days</caption>
                    <thead>
                      <tr className="border-b border-rule-strong">
                        {['Applicator', 'Site / line', 'Part', 'Due', 'Cycles since / interval', 'Parts'].map((h) => (
                          <th key={h} scope="col" className="px-2 py-2 font-semibold">
                            {h}
                          </th>
                        ))}
                      </tr>
                    </thead>
                    <tbody>
                      {d.rows.map((r) => (
                        <tr key={`${r.applicatorId}-${r.part}`} className="border-b border-rule align-top">
                          <td className="px-2 py-2">
                            <Link className="font-semibold text-amber-deep underline" to={`/applicators/${r.applicatorId}`}>
                              {r.tag}
                            </Link>
                          </td>
                          <td className="px-2 py-2">
                            {r.site} / {r.line}
                          </td>
                          <td className="px-2 py-2">{PART_LABELS[r.part]}</td>
                          <td className="px-2 py-2 tabular-nums">
                            {r.status === 'overdue' ? <span className="font-semibold text-danger">Overdue</span> : `${formatDate(r.dueOn)} (${r.daysRemaining} d)`}
                          </td>
                          <td className="px-2 py-2 tabular-nums">
                            {millions(r.cyclesSince)} / {millions(r.threshold)}
                          </td>
                          <td className="px-2 py-2">
                            {r.partsKnown ? (
                              r.parts.map((x) => `${x.quantity} × ${x.name}${x.partNumber ? ` (${x.partNumber})` : ''}`).join('; ')
                            ) : (
                              <span className="text-ink-soft">None known: no earlier service of this kind on it listed parts</span>
                            )}
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </>
            )}
          </section>

          <ForecastCalendar rows={d.rows} today={d.today} days={d.days} />

          <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <h2 className="font-serif text-lg font-semibold">Parts to order</h2>
              {d.partsToOrder.length ? (
                <button
                  type="button"
                  className={buttonClass('secondary')}
                  onClick={() =>
                    downloadCsv(
                      `parts-to-order-${d.today}-${d.days}d.csv`,
                      ['Part number', 'Part', 'Quantity', 'Applicators'],
                      d.partsToOrder.map((x) => [x.partNumber, x.name, x.quantity, x.applicators]),
                    )
                  }
                >
                  Download CSV
                </button>
              ) : null}
            </div>
            <p className="mb-2 text-sm text-ink-soft">Summed by part number from the parts used the last time each applicator had the same service.</p>
            {d.partsToOrder.length ? (
              <DataTable
                caption="Parts to order"
                header={['Part number', 'Part', 'Quantity', 'Applicators']}
                rows={d.partsToOrder.map((x) => [x.partNumber ?? '—', x.name, num(x.quantity), x.applicators])}
              />
            ) : (
              <p>{d.rows.length ? 'None known: earlier services of these kinds recorded no parts.' : 'Nothing is due, so nothing to order.'}</p>
            )}
            {d.partsUnknown > 0 && d.partsToOrder.length ? <p className="mt-2 text-sm">{d.partsUnknown} of the services due have no known parts and are not in these sums.</p> : null}
          </section>

          {d.noForecast.length ? (
            <details className="no-print rounded-lg border border-rule bg-paper-raised p-4">
              <summary className="cursor-pointer font-semibold">
                {d.noForecast.length} running {d.noForecast.length === 1 ? 'applicator' : 'applicators'} cannot be forecast
              </summary>
              <ul className="mt-2 list-disc pl-5 text-sm">
                {d.noForecast.slice(0, 100).map((n) => (
                  <li key={n.applicatorId}>
                    <Link className="underline" to={`/applicators/${n.applicatorId}`}>
                      {n.tag}
                    </Link>
                    : {n.reason}
                  </li>
                ))}
              </ul>
            </details>
          ) : null}
          {d.rows.length === 0 && d.noForecast.length === 0 ? <EmptyState title="Nothing to forecast">There are no running applicators{p.siteId ? ' on this site' : ''}.</EmptyState> : null}
        </>
      ) : null}
      <DigestPanel />
    </div>
  );
}
