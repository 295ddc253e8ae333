// "Continue": the technician's open walks, on the home page.
import { Link } from 'react-router';
import { Skeleton } from '@/components/ui/feedback';
import { useWalks } from '../api/walks';
import { formatDateTime } from '@/lib/format';

export function OpenWalks() {
  const walks = useWalks({ mine: '1', status: 'open' });
  if (walks.isPending) return <Skeleton className="h-16 w-full" />;
  if (walks.isError || !walks.data.length) return null;
  return (
    <section aria-label="Continue a walk" className="space-y-2">
      <h2 className="text-lg font-semibold">Continue</h2>
      <ul className="space-y-2">
        {walks.data.map((w) => (
          <li key={w.id}>
            <Link to={`/walks/${w.id}`} className="flex min-h-14 flex-col justify-center rounded-lg border-2 border-amber-line bg-paper-raised px-4 py-2">
              <span className="font-semibold">{w.guideTitle}</span>
              <span className="text-sm text-ink-soft">
                Step {w.pathLength}: {w.currentStepTitle ?? '—'}
                {w.line ? ` · ${w.line}` : ''} · {formatDateTime(w.updatedAt)}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}
