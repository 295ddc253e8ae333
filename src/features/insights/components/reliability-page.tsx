// Reliability per component: cycles between replacements with running units as suspensions, a
// Weibull fit by maximum likelihood, a probability plot by median-rank regression, and how the
// planned interval compares.
import { useSearchParams } from 'react-router';
import { CartesianGrid, ComposedChart, Line, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import { RELIABILITY_PART_LABELS, RELIABILITY_PARTS, type ReliabilityPart } from '@/shared/schemas/insights';
import { DEFAULT_TAGS } from '@/shared/tags';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { palette } from '../../../../tailwind.config';
import { useReliability } from '../api/insights';
import { millions, num } from '../utils/csv';
import { DataFigure, DataTable } from './figure';
import { Freshness } from './freshness';

export function ReliabilityPage() {
  const [params, setParams] = useSearchParams();
  const p = { part: (params.get('part') ?? 'seat') as ReliabilityPart, actuation: params.get('actuation') ?? undefined, fluidFamily: params.get('fluidFamily') ?? undefined };
  const q = useReliability(p);
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };
  const d = q.data;
  const partLabel = RELIABILITY_PART_LABELS[p.part];
  // The fitted MRR line across the plotted range, in the plot's linearised axes.
  const line =
    d?.plot && d.plot.points.length
      ? (() => {
          const xs = d.plot.points.map((pt) => pt.x);
          const lo = Math.min(...xs) - 0.2;
          const hi = Math.max(...xs) + 0.2;
          return [lo, hi].map((x) => ({ x, fit: d.plot!.shape * (x - Math.log(d.plot!.scale)) }));
        })()
      : [];
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap gap-3">
        <SelectField label="Component" value={p.part} onChange={(e) => set('part', e.target.value === 'seat' ? '' : e.target.value)}>
          {RELIABILITY_PARTS.map((x) => (
            <option key={x} value={x}>
              {RELIABILITY_PART_LABELS[x]}
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
          {DEFAULT_TAGS.filter((t) => t.group === 'fluid').map((f) => (
            <option key={f.slug} value={f.slug}>
              {f.label}
            </option>
          ))}
        </SelectField>
      </div>
      {q.isError ? (
        <Notice tone="error" title="Reliability could not be loaded">
          {errorMessage(q.error)}
        </Notice>
      ) : null}
      {q.isPending ? <LoadingBlock label="Loading reliability" /> : null}
      {d ? (
        <>
          <Freshness asOf={d.asOf} />
          <p className="text-ink-soft">
            {partLabel}: {d.failures} failures and {d.suspensions} suspensions (planned changes and parts still running) from counter readings. A replacement with a cause recorded counts as a failure.
          </p>
          {d.cannotFit ? <EmptyState title="No Weibull fit">{d.cannotFit}</EmptyState> : null}
          {d.fit ? (
            <section className="rounded-lg border border-rule bg-paper-raised p-4 sm:p-5" data-testid="weibull-fit">
              <h2 className="font-serif text-lg font-semibold">Weibull fit (method: maximum likelihood)</h2>
              <dl className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-4">
                <div>
                  <dt className="text-sm text-ink-soft">Shape β</dt>
                  <dd className="text-xl font-semibold">{num(d.fit.shape, 2)}</dd>
                </div>
                <div>
                  <dt className="text-sm text-ink-soft">Scale η</dt>
                  <dd className="text-xl font-semibold">{millions(d.fit.scale)} cycles</dd>
                </div>
                <div>
                  <dt className="text-sm text-ink-soft">B10 life</dt>
                  <dd className="text-xl font-semibold">{millions(d.fit.b10)} cycles</dd>
                </div>
                <div>
                  <dt className="text-sm text-ink-soft">Sample</dt>
                  <dd className="text-xl font-semibold">
                    {d.failures} failed, {d.suspensions} running or planned
                  </dd>
                </div>
              </dl>
              {d.failures < 5 ? (
                <Notice tone="warn" title="Too few failures to trust">
                  Only {d.failures} failures: treat β and η as rough until at least 5 have been recorded.
                </Notice>
              ) : null}
              {d.fit.warnings
                .filter((w) => d.failures >= 5 || !/Only \d+ failures/.test(w))
                .map((w) => (
                  <p key={w} className="mt-2 text-sm">
                    {w}
                  </p>
                ))}
              {d.planned ? (
                <p className="mt-3">
                  Planned interval: {millions(d.planned.cycles)} cycles ({d.planned.sourceKind === 'organisation' ? 'your organisation’s default' : 'common practice'}
                  {d.planned.sourceKind === 'organisation' ? '' : `: ${d.planned.source.replace(/^common practice \(|\)$/g, '')}`}).{' '}
                  {d.planned.unreliabilityAtPlanned !== null
                    ? `By the fit, ${num(100 * d.planned.unreliabilityAtPlanned, 1)} % of parts would have failed by then; B10 is ${d.fit.b10 < d.planned.cycles ? 'shorter' : 'longer'} than the planned interval.`
                    : null}
                </p>
              ) : (
                <p className="mt-3">Coils have no planned replacement interval to compare with.</p>
              )}
            </section>
          ) : null}
          {d.plot ? (
            <DataFigure
              title="Weibull probability plot (median-rank regression)"
              label={`Weibull probability plot of ${d.plot.points.length} failures of the ${partLabel.toLowerCase()}, with the median-rank regression line: shape ${num(d.plot.shape, 2)}, scale ${millions(d.plot.scale)} cycles, R² ${num(d.plot.rSquared, 3)}.`}
              caption={`Points: failures at Benard's median ranks (Johnson-adjusted for suspensions)${d.plot.pointsTotal > d.plot.points.length ? `, ${d.plot.points.length} of ${d.plot.pointsTotal} drawn, evenly spread` : ''}. Line: median-rank regression, β ${num(d.plot.shape, 2)}, η ${millions(d.plot.scale)} cycles, R² ${num(d.plot.rSquared, 3)}. Straight points suggest one failure mode.`}
              header={['Cycles at failure', 'Median rank F', 'ln(cycles)', 'ln(−ln(1−F))']}
              rows={d.plot.points.map((pt) => [Math.round(pt.cycles), num(pt.medianRank, 4), num(pt.x, 4), num(pt.y, 4)])}
              csvName={`weibull-plot-${p.part}.csv`}
              chart={
                <ResponsiveContainer width="100%" height="100%">
                  <ComposedChart margin={{ top: 8, right: 12, bottom: 16, left: 0 }}>
                    <CartesianGrid stroke={palette.rule.DEFAULT} strokeDasharray="3 3" />
                    <XAxis
                      dataKey="x"
                      type="number"
                      domain={['dataMin', 'dataMax']}
                      stroke={palette.ink.soft}
                      fontSize={12}
                      tickFormatter={(v: number) => millions(Math.exp(v))}
                      label={{ value: 'cycles (log scale)', position: 'insideBottom', offset: -8, fontSize: 12 }}
                    />
                    <YAxis
                      dataKey="y"
                      type="number"
                      domain={['auto', 'auto']}
                      stroke={palette.ink.soft}
                      fontSize={12}
                      width={64}
                      tickFormatter={(v: number) => `${Number((100 * (1 - Math.exp(-Math.exp(v)))).toPrecision(2))} %`}
                    />
                    <Tooltip formatter={(v, n) => [num(Number(v), 3), n]} />
                    <Line data={line} dataKey="fit" name="Regression" stroke={palette.ink.DEFAULT} dot={false} isAnimationActive={false} />
                    <Scatter data={d.plot.points} dataKey="y" name="Failures" fill={palette.amber.DEFAULT} isAnimationActive={false} />
                  </ComposedChart>
                </ResponsiveContainer>
              }
            />
          ) : null}
          {d.intervals.length ? (
            <details className="rounded-lg border border-rule bg-paper-raised p-4">
              <summary className="cursor-pointer font-semibold">
                The {d.intervalCount} intervals used{d.intervalCount > d.intervals.length ? ` (first ${d.intervals.length} listed)` : ''}
              </summary>
              <DataTable
                caption="Intervals between replacements"
                header={['Applicator', 'From', 'To', 'Cycles', 'Counted as']}
                rows={d.intervals
                  .slice(0, 500)
                  .map((i) => [
                    i.tag,
                    i.from ?? 'installation',
                    i.to ?? 'still running',
                    millions(i.cycles),
                    i.reason === 'failed' ? 'failure' : i.reason === 'planned' ? 'suspension (planned change)' : 'suspension (running)',
                  ])}
              />
            </details>
          ) : null}
          {d.skipped.length ? (
            <details className="rounded-lg border border-rule bg-paper-raised p-4">
              <summary className="cursor-pointer font-semibold">{d.skipped.length} replacements left out</summary>
              <ul className="mt-2 list-disc pl-5 text-sm">
                {d.skipped.map((s) => (
                  <li key={s}>{s}</li>
                ))}
              </ul>
            </details>
          ) : null}
        </>
      ) : null}
    </div>
  );
}
