// An article's revisions: who saved what when, a readable comparison of any two, and restore.
import { useState } from 'react';
import { Link, useParams } from 'react-router';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { Card, PageHeader } from '@/components/ui/page';
import { useArticle, useComparison, useRestoreRevision, useRevisions, type Chunk } from '../api/articles';
import { formatDateTime } from '@/lib/format';

function Diff({ chunks, block }: { chunks: Chunk[]; block?: boolean }) {
  return (
    <div className={block ? 'whitespace-pre-wrap font-sans leading-relaxed' : ''}>
      {chunks.map((c, i) =>
        c.change === 'added' ? (
          <ins key={i} className="bg-fixed-wash text-fixed no-underline decoration-2 [text-decoration-line:underline]">
            <span className="sr-only">[added] </span>
            {c.value}
          </ins>
        ) : c.change === 'removed' ? (
          <del key={i} className="bg-paper-sunk text-ink-soft">
            <span className="sr-only">[removed] </span>
            {c.value}
          </del>
        ) : (
          <span key={i}>{c.value}</span>
        ),
      )}
    </div>
  );
}

export function ArticleHistoryPage() {
  const id = Number(useParams().id);
  const article = useArticle(id);
  const revisions = useRevisions(id);
  const restore = useRestoreRevision(id);
  const [pair, setPair] = useState<{ from: number; to: number } | null>(null);
  const head = article.data?.headRevision ?? 0;
  const current = pair ?? { from: Math.max(1, head - 1), to: head };
  const comparison = useComparison(id, current.from, current.to, head > 1 && current.from !== current.to);

  if (article.isPending || revisions.isPending) return <LoadingBlock label="Loading the history" />;
  if (article.isError || revisions.isError)
    return (
      <Notice tone="error" title="The history could not be loaded">
        Reload the page to try again.
      </Notice>
    );
  const a = article.data;

  return (
    <div className="mx-auto max-w-4xl">
      <nav className="mb-3 text-sm">
        <Link to={`/articles/${id}`} className="font-semibold text-amber-deep underline">
          Back to the article
        </Link>
      </nav>
      <PageHeader title={`History of “${a.title}”`} lead="Every save is kept. Compare any two revisions, or bring an old one back as a new revision." />
      <div className="grid gap-6 lg:grid-cols-[20rem_1fr]">
        <Card>
          <h2 className="mb-2 text-lg font-semibold">Revisions</h2>
          <ol className="space-y-2">
            {revisions.data.map((r) => (
              <li key={r.number} className="rounded border border-rule p-2">
                <p className="font-semibold">
                  Revision {r.number}
                  {r.published ? <span className="ml-2 rounded bg-fixed-wash px-1.5 text-xs text-fixed">published</span> : null}
                  {r.number === a.headRevision ? <span className="ml-2 rounded bg-amber-wash px-1.5 text-xs text-amber-deep">current</span> : null}
                </p>
                <p className="text-sm text-ink-soft">
                  {r.authorName ?? 'Unknown'} · {formatDateTime(r.updatedAt)}
                </p>
                {r.note ? <p className="text-sm">{r.note}</p> : null}
                <div className="mt-1 flex flex-wrap gap-1">
                  <Button variant="quiet" className="!min-h-9 !px-1 text-sm" onClick={() => setPair({ from: r.number, to: a.headRevision })} disabled={r.number === a.headRevision}>
                    Compare with current
                  </Button>
                  {r.number !== a.headRevision && (a.workflow === 'draft' || a.workflow === 'published') ? (
                    <Button
                      variant="quiet"
                      className="!min-h-9 !px-1 text-sm"
                      busy={restore.isPending}
                      onClick={() => restore.mutate({ number: r.number, baseVersion: a.version }, { onSuccess: (x) => showToast(`Revision ${r.number} restored as revision ${x.headRevision}`, 'ok') })}
                    >
                      Restore
                    </Button>
                  ) : null}
                </div>
              </li>
            ))}
          </ol>
        </Card>
        <Card>
          <h2 className="text-lg font-semibold">
            Revision {current.from} → revision {current.to}
          </h2>
          {head < 2 || current.from === current.to ? (
            <p className="mt-2 text-ink-soft">There is only one revision so far: nothing to compare.</p>
          ) : comparison.isPending ? (
            <LoadingBlock label="Comparing" />
          ) : comparison.isError ? (
            <Notice tone="error" title="The comparison could not be made" />
          ) : (
            <div className="mt-3 space-y-4" data-testid="comparison">
              <p className="text-sm text-ink-soft">
                <ins className="bg-fixed-wash px-1 text-fixed">Added text</ins> and <del className="bg-paper-sunk px-1 text-ink-soft">removed text</del> are marked.
              </p>
              <div>
                <h3 className="text-sm font-semibold text-ink-soft">Title</h3>
                <Diff chunks={comparison.data.title} />
              </div>
              <div>
                <h3 className="text-sm font-semibold text-ink-soft">Summary</h3>
                <Diff chunks={comparison.data.summary} />
              </div>
              {comparison.data.tags.added.length || comparison.data.tags.removed.length ? (
                <p className="text-sm">
                  Tags added: {comparison.data.tags.added.join(', ') || 'none'} · removed: {comparison.data.tags.removed.join(', ') || 'none'}
                </p>
              ) : null}
              <div>
                <h3 className="text-sm font-semibold text-ink-soft">Text</h3>
                <Diff block chunks={comparison.data.body} />
              </div>
            </div>
          )}
        </Card>
      </div>
    </div>
  );
}
