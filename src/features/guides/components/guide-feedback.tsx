// For authors: guides that technicians flagged or whose walks end "not fixed", most needing a look first.
import { Link } from 'react-router';
import { Skeleton } from '@/components/ui/feedback';
import { useGuides } from '../api/guides';

export function GuideFeedback() {
  const guides = useGuides({ status: 'all' });
  if (guides.isPending) return <Skeleton className="h-20 w-full" />;
  if (guides.isError) return null;
  const needing = guides.data
    .filter((g) => g.openFlagCount > 0 || g.walksNotFixed + g.walksFixedByOther > 0)
    .sort((a, b) => b.openFlagCount * 3 + b.walksNotFixed + b.walksFixedByOther - (a.openFlagCount * 3 + a.walksNotFixed + a.walksFixedByOther));
  return (
    <section aria-label="Feedback from the field" className="rounded-lg border border-rule bg-paper-raised p-4">
      <h2 className="mb-2 text-lg font-semibold">Feedback from the field</h2>
      {needing.length === 0 ? (
        <p className="text-ink-soft">No flagged steps and no walks ending “not fixed”.</p>
      ) : (
        <ul className="divide-y divide-rule">
          {needing.slice(0, 6).map((g) => (
            <li key={g.id}>
              <Link to={`/guides/${g.id}/edit`} className="flex min-h-11 flex-wrap items-center justify-between gap-2 py-2 hover:text-amber-deep">
                <span className="font-semibold">{g.title}</span>
                <span className="text-sm text-ink-soft">
                  {g.openFlagCount ? `⚑ ${g.openFlagCount} flagged step${g.openFlagCount > 1 ? 's' : ''}` : ''}
                  {g.openFlagCount && g.walksNotFixed + g.walksFixedByOther ? ' · ' : ''}
                  {g.walksNotFixed + g.walksFixedByOther ? `${g.walksNotFixed} not fixed, ${g.walksFixedByOther} fixed another way` : ''}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
