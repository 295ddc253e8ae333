// "What are you seeing?": the symptoms of the published guides as big chips, one tap to a walk.
import { Link } from 'react-router';
import { Skeleton } from '@/components/ui/feedback';
import { useGuides } from '../api/guides';

export function SymptomChips() {
  const guides = useGuides({});
  return (
    <section aria-labelledby="symptoms-heading">
      <h2 id="symptoms-heading" className="mb-3 text-xl font-semibold">
        What are you seeing?
      </h2>
      {guides.isPending ? (
        <Skeleton className="h-24 w-full" />
      ) : guides.isError ? null : guides.data.filter((g) => g.publishedVersion && g.status === 'active').length === 0 ? (
        <p className="text-ink-soft">No guide has been published yet. Authors publish guides from the Guides page.</p>
      ) : (
        <ul className="flex flex-wrap gap-2">
          {guides.data
            .filter((g) => g.publishedVersion && g.status === 'active')
            .map((g) => (
              <li key={g.id}>
                <Link to={`/guides/${g.id}/walk`} className="inline-flex min-h-14 items-center rounded-2xl border-2 border-amber-line bg-paper-raised px-5 text-lg font-semibold hover:bg-amber-wash">
                  {g.symptom}
                </Link>
              </li>
            ))}
        </ul>
      )}
    </section>
  );
}
