// The manager's home: the last 30 days' top causes as a small Pareto list, repeat failures, and
// services due in the next 30 days, each leading into Insights.
import { Link } from 'react-router';
import { Skeleton } from '@/components/ui/feedback';
import { useCauses, useForecast } from '../api/insights';

function daysAgo(n: number): string {
  return new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
}

export function ManagerSummary() {
  const causes = useCauses({ from: daysAgo(30) });
  const forecast = useForecast({ days: '30' });
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <section aria-label="Top causes, last 30 days" className="rounded-lg border border-rule bg-paper-raised p-4">
        <h2 className="text-lg font-semibold">Top causes, last 30 days</h2>
        {causes.isPending ? (
          <Skeleton className="mt-2 h-24 w-full" />
        ) : causes.isError ? (
          <p className="text-danger">Could not be loaded.</p>
        ) : causes.data.empty || !causes.data.pareto.length ? (
          <p className="mt-1 text-ink-soft">{causes.data.empty ?? 'No causes recorded in the last 30 days.'}</p>
        ) : (
          <ol className="mt-2 space-y-1">
            {causes.data.pareto.slice(0, 5).map((b) => {
              const share = causes.data.total ? Math.round((b.count / causes.data.total) * 100) : 0;
              return (
                <li key={b.code} className="grid grid-cols-[1fr_auto] items-center gap-2">
                  <span>
                    <span className="block text-sm">{b.label}</span>
                    <span className="block h-2 rounded bg-amber" style={{ width: `${Math.max(4, share)}%` }} aria-hidden />
                  </span>
                  <span className="tabular text-sm font-semibold">
                    {b.count} · {share} %
                  </span>
                </li>
              );
            })}
          </ol>
        )}
        {causes.data && causes.data.repeatTotal ? (
          <p className="mt-3 text-sm font-semibold text-danger-deep">
            {causes.data.repeatTotal} repeat failure{causes.data.repeatTotal > 1 ? 's' : ''} within {causes.data.repeatDays} days
          </p>
        ) : null}
        <Link to="/insights" className="mt-3 inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          Recurring causes
        </Link>
      </section>
      <section aria-label="Services due in 30 days" className="rounded-lg border border-rule bg-paper-raised p-4">
        <h2 className="text-lg font-semibold">Services due in 30 days</h2>
        {forecast.isPending ? (
          <Skeleton className="mt-2 h-24 w-full" />
        ) : forecast.isError ? (
          <p className="text-danger">Could not be loaded.</p>
        ) : forecast.data.rows.length === 0 ? (
          <p className="mt-1 text-ink-soft">Nothing is due in the next 30 days.</p>
        ) : (
          <ul className="mt-2 divide-y divide-rule">
            {forecast.data.rows.slice(0, 6).map((r) => (
              <li key={`${r.applicatorId}-${r.part}`} className="flex min-h-11 items-center justify-between gap-2 text-sm">
                <Link to={`/applicators/${r.applicatorId}`} className="font-semibold underline">
                  {r.tag}
                </Link>
                <span>{r.part}</span>
                <span className={r.status === 'overdue' ? 'font-semibold text-danger-deep' : 'text-ink-soft'}>{r.status === 'overdue' ? 'overdue' : `in ${Math.round(r.daysRemaining)} d`}</span>
              </li>
            ))}
          </ul>
        )}
        <Link to="/insights/forecast" className="mt-3 inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          Service forecast
        </Link>
      </section>
    </div>
  );
}
