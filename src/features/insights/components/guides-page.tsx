// Guide effectiveness per guide version: how walks end, where they are given up, how long a Finding
// takes and the flags left open, so authors know which guide to fix first.
import { useSearchParams } from 'react-router';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { EmptyState, LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { palette } from '../../../../tailwind.config';
import { useGuideEffectiveness } from '../api/insights';
import { num } from '../utils/csv';
import { DataFigure } from './figure';
import { Freshness } from './freshness';

const pct = (n: number, of: number) => (of ? `${num((100 * n) / of)} %` : '—');

export function GuidesPage() {
  const [params, setParams] = useSearchParams();
  const p = { from: params.get('from') ?? undefined, to: params.get('to') ?? undefined };
  const q = useGuideEffectiveness(p);
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };
  const d = q.data;
  const name = (v: { title: string; versionNumber: number }) => `${v.title} (v${v.versionNumber})`;
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap gap-3">
        <TextField label="Walks started from" type="date" value={p.from ?? ''} onChange={(e) => set('from', e.target.value)} />
        <TextField label="To" type="date" value={p.to ?? ''} onChange={(e) => set('to', e.target.value)} />
      </div>
      {q.isError ? (
        <Notice tone="error" title="Guide effectiveness could not be loaded">
          {errorMessage(q.error)}
        </Notice>
      ) : null}
      {q.isPending ? <LoadingBlock label="Loading guide effectiveness" /> : null}
      {d ? <Freshness asOf={d.asOf} /> : null}
      {d && d.versions.length === 0 ? (
        <EmptyState title="No walks in this period">
          No guide was walked between {d.from} and {d.to}, so there is nothing to measure.
        </EmptyState>
      ) : null}
      {d && d.versions.length ? (
        <>
          <DataFigure
            title="How walks end, per guide version"
            label={`Stacked bars for ${d.versions.length} guide versions. ${d.versions
              .slice(0, 3)
              .map((v) => `${name(v)}: ${v.started} started, ${v.fixed} fixed, ${v.abandoned} abandoned`)
              .join('; ')}.`}
            caption={`Walks started between ${d.from} and ${d.to}. Fixed, not fixed and fixed by something else are what technicians said at the end.`}
            header={['Guide', 'Version', 'Started', 'Finished', 'Fixed', 'Not fixed', 'Fixed by something else', 'Abandoned', 'Still open', 'Median minutes to a Finding', 'Open flags']}
            rows={d.versions.map((v) => [
              v.title,
              v.versionNumber,
              v.started,
              v.finished,
              v.fixed,
              v.notFixed,
              v.fixedByOther,
              v.abandoned,
              v.open,
              v.medianMinutesToFinding === null ? 'none reached a Finding' : num(v.medianMinutesToFinding, 1),
              v.openFlags,
            ])}
            csvName={`guide-effectiveness-${d.from}-${d.to}.csv`}
            height={d.versions.length > 6 ? 'h-[28rem]' : 'h-72'}
            chart={
              <ResponsiveContainer width="100%" height="100%">
                <BarChart
                  data={d.versions.slice(0, 12).map((v) => ({ ...v, name: name(v), other: Math.max(0, v.finished - v.fixed - v.notFixed - v.fixedByOther) }))}
                  layout="vertical"
                  margin={{ top: 4, right: 12, bottom: 4, left: 8 }}
                >
                  <CartesianGrid stroke={palette.rule.DEFAULT} strokeDasharray="3 3" />
                  <XAxis type="number" allowDecimals={false} stroke={palette.ink.soft} fontSize={12} />
                  <YAxis type="category" dataKey="name" width={220} interval={0} stroke={palette.ink.soft} fontSize={11} tickFormatter={(v: string) => (v.length > 34 ? `${v.slice(0, 33)}…` : v)} />
                  <Tooltip />
                  <Legend />
                  <Bar dataKey="fixed" name="Fixed" stackId="a" fill={palette.fixed.DEFAULT} isAnimationActive={false} />
                  <Bar dataKey="fixedByOther" name="Fixed by something else" stackId="a" fill={palette.amber.line} isAnimationActive={false} />
                  <Bar dataKey="notFixed" name="Not fixed" stackId="a" fill={palette.danger.DEFAULT} isAnimationActive={false} />
                  <Bar dataKey="other" name="Ended otherwise" stackId="a" fill={palette.ink.faint} isAnimationActive={false} />
                  <Bar dataKey="abandoned" name="Abandoned" stackId="a" fill={palette.rule.strong} isAnimationActive={false} />
                  <Bar dataKey="open" name="Still open" stackId="a" fill={palette.amber.deep} isAnimationActive={false} />
                </BarChart>
              </ResponsiveContainer>
            }
          />
          <ul className="grid gap-4 lg:grid-cols-2" data-testid="guide-effectiveness">
            {d.versions.map((v) => (
              <li key={v.versionId} className="rounded-lg border border-rule bg-paper-raised p-4">
                <h2 className="font-serif text-lg font-semibold">{name(v)}</h2>
                <dl className="mt-2 grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-3">
                  <div>
                    <dt className="text-ink-soft">Started</dt>
                    <dd className="font-semibold">{v.started}</dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Finished</dt>
                    <dd className="font-semibold">
                      {v.finished} ({pct(v.finished, v.started)})
                    </dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Fixed</dt>
                    <dd className="font-semibold">
                      {v.fixed} ({pct(v.fixed, v.finished)} of finished)
                    </dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Not fixed</dt>
                    <dd className="font-semibold">{v.notFixed}</dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Fixed by something else</dt>
                    <dd className="font-semibold">{v.fixedByOther}</dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Abandoned</dt>
                    <dd className="font-semibold">{v.abandoned}</dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Median time to a Finding</dt>
                    <dd className="font-semibold">{v.medianMinutesToFinding === null ? 'No walk reached a Finding' : `${num(v.medianMinutesToFinding, 1)} min`}</dd>
                  </div>
                  <div>
                    <dt className="text-ink-soft">Open flags</dt>
                    <dd className="font-semibold">{v.openFlags}</dd>
                  </div>
                </dl>
                {v.abandonedAt.length ? (
                  <p className="mt-2 text-sm">
                    <span className="font-semibold">Given up at: </span>
                    {v.abandonedAt
                      .slice(0, 3)
                      .map((s) => `${s.title} (${s.count})`)
                      .join('; ')}
                  </p>
                ) : null}
              </li>
            ))}
          </ul>
        </>
      ) : null}
    </div>
  );
}
