// A few articles for a home page: reviews waiting, own drafts, or the newest published.
import { Link } from 'react-router';
import { Skeleton } from '@/components/ui/feedback';
import { useArticles, type ArticleFilters } from '../api/articles';
import { formatDate, statusLabel, toneClass } from '../utils/labels';

export function ArticleShortList({ title, filters, empty, limit = 5 }: { title: string; filters: ArticleFilters; empty: string; limit?: number }) {
  const list = useArticles(filters);
  return (
    <section aria-label={title} className="rounded-lg border border-rule bg-paper-raised p-4">
      <h2 className="mb-2 text-lg font-semibold">{title}</h2>
      {list.isPending ? (
        <div className="space-y-2">
          <Skeleton />
          <Skeleton className="h-5 w-2/3" />
        </div>
      ) : list.isError ? (
        <p className="text-danger">Could not be loaded.</p>
      ) : list.data.length === 0 ? (
        <p className="text-ink-soft">{empty}</p>
      ) : (
        <ul className="divide-y divide-rule">
          {list.data.slice(0, limit).map((a) => {
            const s = statusLabel(a);
            return (
              <li key={a.id}>
                <Link to={`/articles/${a.id}`} className="flex min-h-11 flex-wrap items-center justify-between gap-2 py-2 hover:text-amber-deep">
                  <span className="font-semibold">{a.title}</span>
                  <span className="flex items-center gap-2 text-sm text-ink-soft">
                    <span className={`rounded px-1.5 text-xs font-semibold ${toneClass[s.tone]}`}>{s.text}</span>
                    {formatDate(a.updatedAt)}
                  </span>
                </Link>
              </li>
            );
          })}
        </ul>
      )}
    </section>
  );
}
