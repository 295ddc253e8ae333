// Recurring causes: what keeps failing (Pareto of causes from walks' Findings and failure services),
// which valves fail the same way again soon after a fix, and how the top causes move over time.
import { useSearchParams } from 'react-router';
import { Bar, CartesianGrid, ComposedChart, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { DEFAULT_TAGS } from '@/shared/tags';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { palette } from '../../../../tailwind.config';
import { useCauses, useFilterChoices } from '../api/insights';
import { Button } from '@/components/ui/button';
import { downloadCsv, num } from '../utils/csv';
import { DataFigure, DataTable } from './figure';
import { Freshness } from './freshness';

const SERIES = [palette.amber.DEFAULT, palette.fixed.DEFAULT, palette.danger.DEFAULT, palette.ink.soft, palette.amber.line];
// Past a dozen bars the labels no longer fit; the long tail stays in the table and the file.
const PARETO_BARS = 12;
const REPEATS_SHOWN = 15;
const REPEAT_HEADER = ['Applicator', 'Cause', 'First', 'Again', 'Days apart'];
const FILTER_KEYS = ['from', 'to', 'siteId', 'lineId', 'actuation', 'fluidFamily', 'guideId', 'repeatDays', 'bucket'] as const;

export function CausesPage() {
  const [params, setParams] = useSearchParams();
  const p = Object.fromEntries(FILTER_KEYS.map((k) => [k, params.get(k) ?? undefined]));
  const causes = useCauses(p);
  const choices = useFilterChoices();
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    if (k === 'siteId') next.delete('lineId');
    setParams(next, { replace: true });
  };
  const lines = (choices.data?.lines ?? []).filter((l) => !p.siteId || String(l.siteId) === p.siteId);
  const fluids = DEFAULT_TAGS.filter((t) => t.group === 'fluid');
  const d = causes.data;

  return (
    <div className="space-y-5">
      <fieldset className="grid grid-cols-2 gap-3 rounded-lg border border-rule bg-paper-raised p-4 sm:grid-cols-3 lg:grid-cols-5">
        <legend className="px-1 font-semibold">Filters</legend>
        <TextField label="From" type="date" value={p.from ?? ''} onChange={(e) => set('from', e.target.value)} />
        <TextField label="To" type="date" value={p.to ?? ''} onChange={(e) => set('to', e.target.value)} />
        <SelectField label="Site" value={p.siteId ?? ''} onChange={(e) => set('siteId', e.target.value)}>
          <option value="">All sites</option>
          {choices.data?.sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Line" value={p.lineId ?? ''} onChange={(e) => set('lineId', e.target.value)}>
          <option value="">All lines</option>
          {lines.map((l) => (
            <option key={l.id} value={l.id}>
              {l.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Actuation" value={p.actuation ?? ''} onChange={(e) => set('actuation', e.target.value)}>
          <option value="">Any</option>
          <option value="electric">Electric</option>
          <option value="air-operated">Air-operated</option>
        </SelectField>
        <SelectField label="Fluid family" value={p.fluidFamily ?? ''} onChange={(e) => set('fluidFamily', e.target.value)}>
          <option value="">Any</option>
          {fluids.map((f) => (
            <option key={f.slug} value={f.slug}>
              {f.label}
            </option>
          ))}
        </SelectField>
        <SelectField label="Guide" value={p.guideId ?? ''} onChange={(e) => set('guideId', e.target.value)}>
          <option value="">Any guide or none</option>
          {choices.data?.guides.map((g) => (
            <option key={g.id} value={g.id}>
              {g.title}
            </option>
          ))}
        </SelectField>
        <TextField label="Repeat within (days)" type="number" min={1} max={3650} value={p.repeatDays ?? '90'} onChange={(e) => set('repeatDays', e.target.value === '90' ? '' : e.target.value)} />
        <SelectField label="Trend by" value={p.bucket ?? 'month'} onChange={(e) => set('bucket', e.target.value === 'month' ? '' : e.target.value)}>
          <option value="month">Month</option>
          <option value="week">Week</option>
        </SelectField>
      </fieldset>

      {causes.isError ? (
        <Notice tone="error" title="The causes could not be loaded">
          {errorMessage(causes.error)}
        </Notice>
      ) : null}
      {causes.isPending ? <LoadingBlock label="Loading causes" /> : null}
      {d ? <Freshness asOf={d.asOf} /> : null}
      {d && d.empty ? <EmptyState title="No causes to rank">{d.empty}</EmptyState> : null}
      {d && !d.empty ? (
        <>
          <p className="text-ink-soft">
            {num(d.total)} causes between {d.from} and {d.to}: {num(d.fromWalks)} from walks that ended at a Finding, {num(d.fromService)} from services recorded as failures.
          </p>
          <DataFigure
            testId="pareto"
            title="Recurring causes (Pareto)"
            label={`Pareto chart of ${d.pareto.length} causes. ${d.pareto
              .slice(0, 3)
              .map((b) => `${b.label}: ${b.count} (${num(b.percent)} %)`)
              .join('; ')}. The top ${Math.min(3, d.pareto.length)} make up ${num(d.pareto[Math.min(2, d.pareto.length - 1)].cumulativePercent)} % of all.`}
            caption={`Bars: how often each cause was found, most frequent first. Line: the running share of all causes (right axis).${d.pareto.length > PARETO_BARS ? ` The chart shows the top ${PARETO_BARS}; the other ${d.pareto.length - PARETO_BARS} causes (${num(100 - d.pareto[PARETO_BARS - 1].cumulativePercent, 1)} %) are in the table and the CSV.` : ''}`}
            header={['Cause', 'Code', 'Count', 'Share %', 'Cumulative %']}
            rows={d.pareto.map((b) => [b.label, b.code, b.count, num(b.percent, 1), num(b.cumulativePercent, 1)])}
            csvName={`causes-pareto-${d.from}-${d.to}.csv`}
            chart={
              <ResponsiveContainer width="100%" height="100%">
                <ComposedChart data={d.pareto.slice(0, PARETO_BARS)} margin={{ top: 8, right: 8, bottom: 4, left: 36 }}>
                  <CartesianGrid stroke={palette.rule.DEFAULT} strokeDasharray="3 3" />
                  <XAxis
                    dataKey="label"
                    stroke={palette.ink.soft}
                    fontSize={11}
                    interval={0}
                    angle={-35}
                    textAnchor="end"
                    height={90}
                    tickFormatter={(v: string) => (v.length > 22 ? `${v.slice(0, 21)}…` : v)}
                  />
                  <YAxis yAxisId="n" allowDecimals={false} stroke={palette.ink.soft} fontSize={12} width={40} />
                  <YAxis yAxisId="pct" orientation="right" domain={[0, 100]} stroke={palette.ink.soft} fontSize={12} width={44} tickFormatter={(v: number) => `${v} %`} />
                  <Tooltip formatter={(v, name) => (name === 'Cumulative %' ? [`${num(Number(v), 1)} %`, name] : [v, name])} />
                  <Bar yAxisId="n" dataKey="count" name="Count" fill={palette.amber.DEFAULT} isAnimationActive={false} />
                  <Line yAxisId="pct" dataKey="cumulativePercent" name="Cumulative %" stroke={palette.ink.DEFAULT} strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
                </ComposedChart>
              </ResponsiveContainer>
            }
          />

          <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5">
            <h2 className="font-serif text-lg font-semibold">Repeat failures</h2>
            <p className="mb-2 text-sm text-ink-soft">The same cause on the same applicator again within {d.repeatDays} days: the first fix may have treated a symptom.</p>
            {d.repeats.length === 0 ? (
              <p>No cause came back on the same applicator within {d.repeatDays} days in this period.</p>
            ) : (
              <>
                <p className="mb-2">
                  {num(d.repeatTotal)} repeats{d.repeatTotal > d.repeats.length ? ` (the latest ${d.repeats.length} listed)` : ''}, latest first.
                </p>
                <DataTable caption="Repeat failures" header={REPEAT_HEADER} rows={d.repeats.slice(0, REPEATS_SHOWN).map((r) => [r.tag, r.label, r.firstOn, r.repeatOn, r.daysApart])} />
                <div className="mt-2 flex flex-wrap gap-2">
                  <Button
                    type="button"
                    variant="secondary"
                    onClick={() =>
                      downloadCsv(
                        `repeat-failures-${d.repeatDays}d-${d.from}-${d.to}.csv`,
                        REPEAT_HEADER,
                        d.repeats.map((r) => [r.tag, r.label, r.firstOn, r.repeatOn, r.daysApart]),
                      )
                    }
                  >
                    Download CSV
                  </Button>
                </div>
                {d.repeats.length > REPEATS_SHOWN ? (
                  <details className="mt-2">
                    <summary className="cursor-pointer font-semibold">Show the other {d.repeats.length - REPEATS_SHOWN}</summary>
                    <DataTable caption="More repeat failures" header={REPEAT_HEADER} rows={d.repeats.slice(REPEATS_SHOWN).map((r) => [r.tag, r.label, r.firstOn, r.repeatOn, r.daysApart])} />
                  </details>
                ) : null}
              </>
            )}
          </section>

          {d.trend.length < 2 ? (
            <Notice title="No trend yet">
              The causes fall in {d.trend.length} {d.bucket === 'week' ? 'week' : 'month'} only; a trend needs at least two. Widen the period or show it by week.
            </Notice>
          ) : (
            <DataFigure
              title={`Top causes by ${d.bucket}`}
              label={`Line chart of the ${d.trendCodes.length} most frequent causes per ${d.bucket}, from ${d.trend[0].period} to ${d.trend[d.trend.length - 1].period}.`}
              caption={`Each line is one of the ${d.trendCodes.length} most frequent causes; ${d.bucket === 'week' ? 'weeks start on Monday' : 'months by their first day'}.`}
              header={['Period starting', ...d.trendCodes.map((c) => d.pareto.find((b) => b.code === c)?.label ?? c)]}
              rows={d.trend.map((t) => [t.period, ...d.trendCodes.map((c) => t.counts[c] ?? 0)])}
              csvName={`causes-trend-${d.bucket}-${d.from}-${d.to}.csv`}
              chart={
                <ResponsiveContainer width="100%" height="100%">
                  <LineChart data={d.trend.map((t) => ({ period: t.period, ...t.counts }))} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
                    <CartesianGrid stroke={palette.rule.DEFAULT} strokeDasharray="3 3" />
                    <XAxis dataKey="period" stroke={palette.ink.soft} fontSize={12} minTickGap={16} />
                    <YAxis allowDecimals={false} stroke={palette.ink.soft} fontSize={12} width={40} />
                    <Tooltip />
                    <Legend />
                    {d.trendCodes.map((c, i) => (
                      <Line key={c} dataKey={c} name={d.pareto.find((b) => b.code === c)?.label ?? c} stroke={SERIES[i % SERIES.length]} strokeWidth={2} dot={{ r: 2 }} isAnimationActive={false} />
                    ))}
                  </LineChart>
                </ResponsiveContainer>
              }
            />
          )}
        </>
      ) : null}
    </div>
  );
}
