// A chart with its accessible label, a table view of the same figures and a CSV download: every
// insight can be read without seeing the chart and taken away as a file.
import { useId, useState, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { downloadCsv, type Cell } from '../utils/csv';

export function DataFigure(props: {
  title: string;
  /** What the chart shows, in words, for screen readers. */
  label: string;
  caption?: ReactNode;
  chart: ReactNode;
  header: string[];
  rows: Cell[][];
  csvName: string;
  testId?: string;
  /** Tailwind height class of the chart area. */
  height?: string;
}) {
  const [asTable, setAsTable] = useState(false);
  const headingId = useId();
  return (
    <figure className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5" aria-labelledby={headingId} data-testid={props.testId}>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <h2 id={headingId} className="font-serif text-lg font-semibold">
          {props.title}
        </h2>
        <div className="flex gap-2">
          <Button variant="secondary" type="button" aria-pressed={asTable} onClick={() => setAsTable((v) => !v)}>
            {asTable ? 'Show chart' : 'Show table'}
          </Button>
          <Button variant="secondary" type="button" onClick={() => downloadCsv(props.csvName, props.header, props.rows)}>
            Download CSV
          </Button>
        </div>
      </div>
      {asTable ? (
        <DataTable header={props.header} rows={props.rows} caption={props.title} />
      ) : (
        <div className={`${props.height ?? 'h-72'} w-full`} role="img" aria-label={props.label}>
          {props.chart}
        </div>
      )}
      {props.caption ? <figcaption className="mt-2 text-sm text-ink-soft">{props.caption}</figcaption> : null}
    </figure>
  );
}

export function DataTable({ header, rows, caption }: { header: string[]; rows: Cell[][]; caption: string }) {
  return (
    // Focusable so a keyboard can scroll a table wider than a phone.
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label={caption}>
      <table className="w-full text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-rule-strong">
            {header.map((h) => (
              <th key={h} scope="col" className="px-2 py-2 font-semibold">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i} className="border-b border-rule">
              {r.map((c, j) => (
                <td key={j} className="px-2 py-2 tabular-nums">
                  {c ?? '—'}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
