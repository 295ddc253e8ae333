// The coming services on a calendar: a month grid on wider screens and in print, a list by day on
// phones. Days with services are buttons in one tab stop (arrow keys move between them, Home and
// End jump to the first and last); choosing one lists its services below the grid.
import { useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { Link } from 'react-router';
import type { ForecastRow } from '@/shared/schemas/insights';
import { formatDate } from '@/lib/format';

const PART_LABELS = { seat: 'Seat', needle: 'Needle', seals: 'Seals' } as const;
const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];
const WEEKDAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'];

const DAY_MS = 86_400_000;
const dayOf = (iso: string) => Date.parse(`${iso}T00:00:00Z`);
const isoOf = (ms: number) => new Date(ms).toISOString().slice(0, 10);

function monthTitle(year: number, month: number): string {
  return new Intl.DateTimeFormat(undefined, { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(Date.UTC(year, month, 1));
}

function describe(rows: ForecastRow[]): string {
  return rows.map((r) => `${r.tag} ${PART_LABELS[r.part].toLowerCase()}${r.status === 'overdue' ? ' (overdue)' : ''}`).join(', ');
}

/** Weeks (Monday first) of each month from `from` to `to`, with the services due on each day. */
function months(from: string, to: string, byDay: Map<string, ForecastRow[]>) {
  const out: { key: string; title: string; weeks: ({ iso: string; inRange: boolean; rows: ForecastRow[] } | null)[][] }[] = [];
  const start = new Date(dayOf(from));
  const end = dayOf(to);
  for (let y = start.getUTCFullYear(), m = start.getUTCMonth(); Date.UTC(y, m, 1) <= end; m === 11 ? ((y += 1), (m = 0)) : (m += 1)) {
    const first = Date.UTC(y, m, 1);
    const daysIn = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
    const lead = (new Date(first).getUTCDay() + 6) % 7;
    const cells: ({ iso: string; inRange: boolean; rows: ForecastRow[] } | null)[] = Array.from({ length: lead }, () => null);
    for (let d = 0; d < daysIn; d++) {
      const iso = isoOf(first + d * DAY_MS);
      cells.push({ iso, inRange: iso >= from && iso <= to, rows: byDay.get(iso) ?? [] });
    }
    while (cells.length % 7) cells.push(null);
    const weeks = Array.from({ length: cells.length / 7 }, (_, i) => cells.slice(i * 7, i * 7 + 7));
    out.push({ key: `${y}-${m}`, title: monthTitle(y, m), weeks });
  }
  return out;
}

export function ForecastCalendar({ rows, today, days }: { rows: ForecastRow[]; today: string; days: number }) {
  const to = isoOf(dayOf(today) + days * DAY_MS);
  const byDay = useMemo(() => {
    const m = new Map<string, ForecastRow[]>();
    for (const r of rows) m.set(r.dueOn, [...(m.get(r.dueOn) ?? []), r]);
    return m;
  }, [rows]);
  const busyDays = useMemo(() => [...byDay.keys()].sort(), [byDay]);
  const [focused, setFocused] = useState<string | null>(null);
  const [chosen, setChosen] = useState<string | null>(null);
  const buttons = useRef(new Map<string, HTMLButtonElement>());
  const active = focused && byDay.has(focused) ? focused : busyDays[0];
  const grid = months(today, to, byDay);

  function onKey(e: KeyboardEvent, iso: string) {
    const i = busyDays.indexOf(iso);
    let next: string | undefined;
    if (e.key === 'ArrowRight' || e.key === 'ArrowDown') next = busyDays[Math.min(busyDays.length - 1, i + 1)];
    else if (e.key === 'ArrowLeft' || e.key === 'ArrowUp') next = busyDays[Math.max(0, i - 1)];
    else if (e.key === 'Home') next = busyDays[0];
    else if (e.key === 'End') next = busyDays[busyDays.length - 1];
    if (!next) return;
    e.preventDefault();
    setFocused(next);
    buttons.current.get(next)?.focus();
  }

  const label = (iso: string, list: ForecastRow[]) => `${formatDate(iso)}: ${list.length} ${list.length === 1 ? 'service' : 'services'} due, ${describe(list)}`;

  return (
    <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5" aria-labelledby="forecast-calendar" data-print="calendar">
      <h2 id="forecast-calendar" className="font-serif text-lg font-semibold">
        Calendar, next {days} days
      </h2>
      {rows.length === 0 ? (
        <p className="mt-2">No service falls due in the next {days} days.</p>
      ) : (
        <>
          {/* Phones: a list by day. */}
          <ol className="mt-3 space-y-3 sm:hidden print:hidden" aria-label="Services by day">
            {busyDays.map((iso) => (
              <li key={iso} className="rounded border border-amber-line bg-amber-wash p-3">
                <h3 className="font-semibold">{iso === today ? `Today, ${formatDate(iso)}` : formatDate(iso)}</h3>
                <ul className="mt-1 space-y-1 text-sm">
                  {byDay.get(iso)!.map((r) => (
                    <li key={`${r.applicatorId}-${r.part}`}>
                      <Link className="font-semibold text-amber-deep underline" to={`/applicators/${r.applicatorId}`}>
                        {r.tag}
                      </Link>{' '}
                      {PART_LABELS[r.part].toLowerCase()} · {r.site} / {r.line}
                      {r.status === 'overdue' ? <span className="font-semibold text-danger"> · overdue</span> : null}
                    </li>
                  ))}
                </ul>
              </li>
            ))}
          </ol>
          {/* Wider screens and paper: month grids. */}
          <div
            className="mt-3 hidden gap-4 sm:grid lg:grid-cols-2 print:grid print:grid-cols-1"
            role="group"
            aria-label={`Month view, ${busyDays.length} days with services due; arrow keys move between them`}
          >
            {grid.map((month) => (
              <table key={month.key} className="w-full table-fixed border-collapse text-sm">
                <caption className="mb-1 text-left font-semibold">{month.title}</caption>
                <thead>
                  <tr>
                    {WEEKDAYS.map((w, i) => (
                      <th key={w} scope="col" className="border-b border-rule-strong py-1 text-center font-semibold">
                        <abbr title={WEEKDAY_NAMES[i]} className="no-underline">
                          {w}
                        </abbr>
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {month.weeks.map((week, wi) => (
                    <tr key={wi}>
                      {week.map((cell, ci) => {
                        if (!cell) return <td key={ci} className="border border-rule bg-paper-sunk" />;
                        const list = cell.rows;
                        const n = Number(cell.iso.slice(8));
                        return (
                          <td
                            key={ci}
                            className={`h-16 border border-rule p-1 align-top ${cell.inRange ? '' : 'bg-paper-sunk text-ink-soft'} ${cell.iso === today ? 'ring-2 ring-inset ring-amber' : ''}`}
                          >
                            {list.length ? (
                              <button
                                ref={(el) => {
                                  if (el) buttons.current.set(cell.iso, el);
                                  else buttons.current.delete(cell.iso);
                                }}
                                type="button"
                                tabIndex={cell.iso === active ? 0 : -1}
                                aria-label={label(cell.iso, list)}
                                aria-pressed={chosen === cell.iso}
                                onFocus={() => setFocused(cell.iso)}
                                onKeyDown={(e) => onKey(e, cell.iso)}
                                onClick={() => setChosen(chosen === cell.iso ? null : cell.iso)}
                                className={`flex h-full min-h-11 w-full flex-col items-start rounded p-1 text-left ${list.some((r) => r.status === 'overdue') ? 'bg-danger/10' : 'bg-amber-wash'} hover:bg-amber-line focus-visible:outline-2 focus-visible:outline-amber-deep ${chosen === cell.iso ? 'outline-2 outline-amber-deep' : ''}`}
                              >
                                <span className="font-semibold">{n}</span>
                                <span aria-hidden className="line-clamp-2 text-xs leading-tight">
                                  {list.length <= 2 ? describe(list) : `${list.length} services`}
                                </span>
                              </button>
                            ) : (
                              <span className="p-1" aria-hidden={!cell.inRange}>
                                {n}
                              </span>
                            )}
                          </td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            ))}
          </div>
          {chosen && byDay.get(chosen) ? (
            <div className="mt-3 hidden rounded border border-amber-line bg-amber-wash p-3 sm:block print:hidden" aria-live="polite">
              <h3 className="font-semibold">Due {chosen === today ? 'today' : formatDate(chosen)}</h3>
              <ul className="mt-1 space-y-1 text-sm">
                {byDay.get(chosen)!.map((r) => (
                  <li key={`${r.applicatorId}-${r.part}`}>
                    <Link className="font-semibold text-amber-deep underline" to={`/applicators/${r.applicatorId}`}>
                      {r.tag}
                    </Link>{' '}
                    {PART_LABELS[r.part].toLowerCase()} · {r.site} / {r.line}
                    {r.status === 'overdue' ? ' · overdue' : ''}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          {/* On paper every day's services are spelled out under the grids. */}
          <ul className="mt-3 hidden text-sm print:block">
            {busyDays.map((iso) => (
              <li key={iso} className="break-inside-avoid">
                <span className="font-semibold">{formatDate(iso)}:</span>{' '}
                {byDay
                  .get(iso)!
                  .map((r) => `${r.tag} ${PART_LABELS[r.part].toLowerCase()} (${r.site} / ${r.line})`)
                  .join('; ')}
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
