// The support desk's home: the big "Log a call", open cases per status, and the ones waiting longest.
import { Link } from 'react-router';
import { CASE_STATUS_LABELS, OPEN_CASE_STATUSES } from '@/shared/schemas/cases';
import { ButtonLink } from '@/components/ui/button';
import { Skeleton } from '@/components/ui/feedback';
import { Icon } from '@/components/ui/icons';
import { useCases } from '../api/cases';
import { PriorityBadge, StatusBadge, ago, callerOf, placeOf } from './case-bits';

export function CaseQueue() {
  const queue = useCases({ status: 'open', sort: 'created', dir: 'asc', page: 1, pageSize: 6 }, { poll: true });
  const counts = queue.data?.counts;
  return (
    <section aria-labelledby="queue-heading" className="space-y-4">
      <ButtonLink to="/cases/new" className="w-full !min-h-16 text-xl sm:w-auto sm:px-10">
        <Icon.phone /> Log a call
      </ButtonLink>
      <div>
        <h2 id="queue-heading" className="mb-3 text-xl font-semibold">
          The case queue
        </h2>
        <ul className="grid grid-cols-2 gap-2 sm:grid-cols-4" aria-label="Open cases per status">
          {OPEN_CASE_STATUSES.map((s) => (
            <li key={s}>
              <Link to={`/cases?status=${s}`} className="flex min-h-20 flex-col justify-between rounded-lg border border-rule bg-paper-raised p-3 hover:bg-paper-sunk">
                <span className="text-sm font-semibold text-ink-soft">{CASE_STATUS_LABELS[s]}</span>
                <span className="tabular text-3xl font-semibold" data-count={s}>
                  {counts ? counts[s] : '–'}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      </div>
      <div>
        <h3 className="mb-2 font-serif text-lg font-semibold">Waiting longest</h3>
        {queue.isPending ? (
          <Skeleton className="h-32 w-full" />
        ) : queue.isError ? null : queue.data.cases.length === 0 ? (
          <p className="text-ink-soft">No open case. When a plant calls, log the call.</p>
        ) : (
          <ul className="space-y-2">
            {queue.data.cases.map((c) => (
              <li key={c.id}>
                <Link to={`/cases/${c.id}`} className="flex flex-wrap items-center justify-between gap-2 rounded-lg border border-rule bg-paper-raised p-3 hover:bg-paper-sunk">
                  <span className="min-w-0">
                    <span className="block font-semibold">
                      {c.id} · {callerOf(c)} <span className="font-normal text-ink-soft">· {placeOf(c)}</span>
                    </span>
                    <span className="block">{c.symptom}</span>
                  </span>
                  <span className="flex items-center gap-2">
                    {c.priority !== 'normal' ? <PriorityBadge priority={c.priority} /> : null}
                    <StatusBadge status={c.status} />
                    <span className="tabular text-sm text-ink-soft">{ago(c.createdAt)}</span>
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        )}
        <Link to="/cases" className="mt-2 inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          All cases
        </Link>
      </div>
    </section>
  );
}
