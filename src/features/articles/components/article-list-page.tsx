// Articles: readers see what is published; authors also see drafts, reviews waiting and the archive.
import { useState } from 'react';
import { Link, useSearchParams } from 'react-router';
import { HAZARDS, type Hazard } from '@/shared/tags';
import { useCan } from '@/lib/auth';
import { ButtonLink } from '@/components/ui/button';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page';
import { useArticles, useTags } from '../api/articles';
import { formatDate, statusLabel, toneClass } from '../utils/labels';
import { TagList } from '@/components/tags/tag-chips';

const AUTHOR_TABS = [
  { key: 'all', label: 'All' },
  { key: 'mine', label: 'My articles' },
  { key: 'review-queue', label: 'Waiting for my review' },
  { key: 'draft', label: 'Drafts' },
  { key: 'published', label: 'Published' },
  { key: 'archived', label: 'Archived' },
];

export function ArticleListPage() {
  const isAuthor = useCan('articles:write');
  const [params, setParams] = useSearchParams();
  const tab = params.get('tab') ?? 'all';
  const tag = params.get('tag') ?? '';
  const [q, setQ] = useState(params.get('q') ?? '');
  const tags = useTags();
  const list = useArticles({
    status: isAuthor ? (tab === 'mine' ? 'all' : tab) : undefined,
    mine: isAuthor && tab === 'mine' ? '1' : undefined,
    tag: tag || undefined,
    q: params.get('q') || undefined,
  });
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };

  return (
    <div>
      <PageHeader
        title="Articles"
        lead="Know-how from senior technicians: how parts wear, how to service them, which materials suit which fluid."
        actions={isAuthor ? <ButtonLink to="/articles/new">New article</ButtonLink> : null}
      />
      {isAuthor ? (
        <div role="tablist" aria-label="Which articles" className="-mx-1 mb-4 flex gap-1 overflow-x-auto pb-1">
          {AUTHOR_TABS.map((t) => (
            <button
              key={t.key}
              role="tab"
              aria-selected={tab === t.key}
              onClick={() => set('tab', t.key === 'all' ? '' : t.key)}
              className={`min-h-11 shrink-0 rounded-md px-3 font-semibold ${tab === t.key ? 'bg-amber-wash text-amber-deep' : 'text-ink-soft hover:bg-paper-sunk'}`}
            >
              {t.label}
            </button>
          ))}
        </div>
      ) : null}
      <form
        className="mb-4 flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          set('q', q.trim());
        }}
      >
        <TextField label="Find in articles" className="min-w-56 flex-1" value={q} onChange={(e) => setQ(e.target.value)} type="search" placeholder="seat, O-ring, hot melt…" />
        <div>
          <label htmlFor="tag-filter" className="mb-1 block text-sm font-semibold">
            Tag
          </label>
          <select id="tag-filter" className="min-h-11 rounded-md border border-rule-strong bg-paper-raised px-3" value={tag} onChange={(e) => set('tag', e.target.value)}>
            <option value="">Any tag</option>
            {tags.data?.map((t) => (
              <option key={t.slug} value={t.slug}>
                {t.label}
              </option>
            ))}
          </select>
        </div>
      </form>
      {list.isPending ? (
        <ListSkeleton label="Loading articles" />
      ) : list.isError ? (
        <Notice tone="error" title="Articles could not be loaded">
          Reload the page to try again.
        </Notice>
      ) : list.data.length === 0 ? (
        <EmptyState title={params.get('q') || tag ? 'No article matches' : 'No articles here yet'}>
          {params.get('q') || tag ? 'Try fewer words or another tag.' : isAuthor ? 'Write the first one with “New article”.' : 'Authors have not published any articles yet.'}
        </EmptyState>
      ) : (
        <ul className="space-y-3">
          {list.data.map((a) => {
            const s = statusLabel(a);
            return (
              <li key={a.id}>
                <Link to={`/articles/${a.id}`} className="block rounded-lg border border-rule bg-paper-raised p-4 hover:border-amber">
                  <div className="flex flex-wrap items-start justify-between gap-2">
                    <h2 className="text-lg font-semibold">{a.title}</h2>
                    {isAuthor ? <span className={`rounded px-2 py-0.5 text-xs font-semibold ${toneClass[s.tone]}`}>{s.text}</span> : null}
                  </div>
                  {a.summary ? <p className="mt-1 text-ink-soft">{a.summary}</p> : null}
                  {a.hazards.length ? <p className="mt-2 text-sm font-semibold text-danger-deep">Cautions: {a.hazards.map((h) => HAZARDS[h as Hazard] ?? h).join('; ')}</p> : null}
                  <div className="mt-2 flex flex-wrap items-center gap-3 text-sm text-ink-soft">
                    <TagList slugs={a.tags} tags={tags.data ?? []} />
                    <span>Updated {formatDate(a.updatedAt)}</span>
                  </div>
                </Link>
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}
