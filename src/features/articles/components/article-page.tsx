// Reading an article: cautions first, readable type, photos full screen, print-friendly; authors
// also get its state and the review actions.
import { useEffect, useRef, useState } from 'react';
import { Link, useParams } from 'react-router';
import { HAZARDS, type Hazard } from '@/shared/tags';
import type { ArticleDetail } from '@/shared/schemas/articles';
import { useCan, useMe } from '@/lib/auth';
import { showToast } from '@/lib/toasts';
import { Button, ButtonLink } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { NotFoundPage } from '@/components/errors/route-error';
import { ApiError } from '@/lib/api-client';
import { useArticle, useArticleAction, useTags } from '../api/articles';
import { formatDate, statusLabel, toneClass } from '../utils/labels';
import { TagList } from '@/components/tags/tag-chips';

function CautionSummary({ articleId, hazards }: { articleId: number; hazards: string[] }) {
  const key = `beadpath.ack.article.${articleId}`;
  const [acked, setAcked] = useState<string[]>(() => JSON.parse(localStorage.getItem(key) ?? '[]'));
  if (!hazards.length) return null;
  const toggle = (h: string) => {
    const next = acked.includes(h) ? acked.filter((x) => x !== h) : [...acked, h];
    setAcked(next);
    localStorage.setItem(key, JSON.stringify(next));
  };
  return (
    <section aria-label="Cautions in this article" className="mb-6 rounded-md border-2 border-l-8 border-danger bg-danger-wash px-4 py-3">
      <p className="font-bold text-danger-deep">Before you start: this work involves</p>
      <ul className="mt-2 space-y-2">
        {hazards.map((h) => (
          <li key={h}>
            <label className="flex min-h-11 cursor-pointer items-center gap-3">
              <input type="checkbox" className="size-6 accent-[#B3261E]" checked={acked.includes(h)} onChange={() => toggle(h)} />
              <span>
                <span className="font-semibold">{HAZARDS[h as Hazard] ?? h}</span>
                <span className="block text-sm text-ink-soft">I have read the caution below and made this safe: locked out, pressure relieved, cooled, protected.</span>
              </span>
            </label>
          </li>
        ))}
      </ul>
      <p className="mt-2 text-sm">Follow local codes, your site&rsquo;s rules and the equipment maker&rsquo;s manual; they come before this article.</p>
    </section>
  );
}

/** Sanitised HTML from the server; clicking a photo opens its large size full screen. */
function ArticleBody({ html }: { html: string }) {
  const ref = useRef<HTMLDivElement>(null);
  const [photo, setPhoto] = useState<{ src: string; alt: string } | null>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const onClick = (e: MouseEvent) => {
      const img = (e.target as HTMLElement).closest('img');
      if (img) setPhoto({ src: img.getAttribute('src')!.replace(/\/display$/, '/large'), alt: img.alt });
    };
    el.addEventListener('click', onClick);
    for (const img of Array.from(el.querySelectorAll('img'))) {
      img.loading = 'lazy';
      img.tabIndex = 0;
      img.setAttribute('role', 'button');
      img.onkeydown = (e) => {
        if (e.key === 'Enter' || e.key === ' ') setPhoto({ src: img.getAttribute('src')!.replace(/\/display$/, '/large'), alt: img.alt });
      };
    }
    return () => el.removeEventListener('click', onClick);
  }, [html]);
  return (
    <>
      <div ref={ref} className="prose-bp" dangerouslySetInnerHTML={{ __html: html }} />
      {photo ? (
        <div role="dialog" aria-modal="true" aria-label={photo.alt || 'Photo'} className="fixed inset-0 z-50 flex flex-col bg-ink/95" onClick={() => setPhoto(null)}>
          <button type="button" className="m-2 min-h-11 self-end rounded-md bg-paper px-4 font-semibold" onClick={() => setPhoto(null)} autoFocus>
            Close
          </button>
          <img src={photo.src} alt={photo.alt} className="m-auto max-h-[85vh] max-w-full object-contain" />
          {photo.alt ? <p className="p-3 text-center text-paper">{photo.alt}</p> : null}
        </div>
      ) : null}
    </>
  );
}

function AuthorPanel({ article }: { article: ArticleDetail }) {
  const { data: me } = useMe();
  const canReview = useCan('articles:review');
  const action = useArticleAction(article.id);
  const [sendBack, setSendBack] = useState(false);
  const [comment, setComment] = useState('');
  const s = statusLabel(article);
  const isSubmitter = article.submittedById === me?.user.id;
  const run = (a: Parameters<typeof action.mutate>[0]['action'], done: string, c?: string) => action.mutate({ action: a, comment: c }, { onSuccess: () => showToast(done, 'ok') });
  const lastChanges = article.events.find((e) => e.kind === 'changes_requested');

  return (
    <section aria-label="Article state" className="no-print mb-6 rounded-lg border border-rule bg-paper-raised p-4">
      <div className="flex flex-wrap items-center gap-3">
        <span className={`rounded px-2 py-1 text-sm font-semibold ${toneClass[s.tone]}`}>{s.text}</span>
        <span className="text-sm text-ink-soft">
          Revision {article.headRevision}
          {article.publishedRevision ? ` · published revision ${article.publishedRevision.number}` : ''}
        </span>
      </div>
      {article.workflow === 'draft' && lastChanges && lastChanges.createdAt > (article.events.find((e) => e.kind === 'submitted')?.createdAt ?? '') ? (
        <div className="mt-3">
          <Notice tone="warn" title={`${lastChanges.userName ?? 'A reviewer'} asked for changes`}>
            {lastChanges.comment}
          </Notice>
        </div>
      ) : null}
      <div className="mt-3 flex flex-wrap gap-2">
        {article.workflow === 'draft' || article.workflow === 'published' ? <ButtonLink to={`/articles/${article.id}/edit`}>Edit</ButtonLink> : null}
        {article.workflow === 'draft' ? (
          <Button variant="secondary" busy={action.isPending} onClick={() => run('submit', 'Submitted for review')}>
            Submit for review
          </Button>
        ) : null}
        {article.workflow === 'in_review' && canReview && !isSubmitter ? (
          <>
            <Button busy={action.isPending} onClick={() => run('approve', 'Approved and published')}>
              Approve and publish
            </Button>
            <Button variant="secondary" onClick={() => setSendBack(true)}>
              Send back with a comment
            </Button>
          </>
        ) : null}
        {article.workflow === 'in_review' && isSubmitter ? (
          <>
            <p className="self-center text-sm text-ink-soft">Waiting for another author to review it.</p>
            <Button variant="secondary" busy={action.isPending} onClick={() => run('withdraw', 'Withdrawn from review')}>
              Withdraw to edit
            </Button>
          </>
        ) : null}
        <ButtonLink variant="secondary" to={`/articles/${article.id}/history`}>
          History
        </ButtonLink>
        {article.workflow === 'archived' ? (
          <Button variant="secondary" busy={action.isPending} onClick={() => run('unarchive', 'Restored from the archive')}>
            Restore from archive
          </Button>
        ) : article.workflow !== 'in_review' ? (
          <Button
            variant="quiet"
            onClick={() => {
              if (window.confirm('Archive this article? Readers will no longer see it; its history is kept.')) run('archive', 'Archived');
            }}
          >
            Archive
          </Button>
        ) : null}
      </div>
      <Dialog open={sendBack} title="Send back to the author" onClose={() => setSendBack(false)}>
        <form
          onSubmit={(e) => {
            e.preventDefault();
            if (!comment.trim()) return;
            action.mutate(
              { action: 'request-changes', comment },
              {
                onSuccess: () => {
                  setSendBack(false);
                  setComment('');
                  showToast('Sent back to the author', 'ok');
                },
              },
            );
          }}
          className="space-y-4"
        >
          <TextField label="What should change?" value={comment} onChange={(e) => setComment(e.target.value)} autoFocus />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setSendBack(false)}>
              Cancel
            </Button>
            <Button type="submit" disabled={!comment.trim()} busy={action.isPending}>
              Send back
            </Button>
          </div>
        </form>
      </Dialog>
    </section>
  );
}

export function ArticlePage() {
  const id = Number(useParams().id);
  const isAuthor = useCan('articles:write');
  const article = useArticle(id);
  const tags = useTags();
  if (article.isPending) return <LoadingBlock label="Loading the article" />;
  if (article.isError) {
    if (article.error instanceof ApiError && article.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The article could not be loaded">
        Reload the page to try again.
      </Notice>
    );
  }
  const a = article.data;
  // Authors read the working copy; everyone else the approved revision.
  const shown = (isAuthor ? a.head : a.publishedRevision) ?? a.publishedRevision ?? a.head!;
  return (
    <article className="mx-auto max-w-3xl">
      <nav className="no-print mb-3 text-sm">
        <Link to="/articles" className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
          All articles
        </Link>
      </nav>
      {isAuthor ? <AuthorPanel article={a} /> : null}
      <header className="mb-5">
        <h1 className="text-3xl font-semibold leading-tight">{shown.title}</h1>
        {shown.summary ? <p className="mt-2 text-lg text-ink-soft">{shown.summary}</p> : null}
        <div className="mt-3 flex flex-wrap items-center gap-3 text-sm text-ink-soft">
          <TagList slugs={shown.tags} tags={tags.data ?? []} />
          {a.reviewedAt ? (
            <span>
              Last reviewed {formatDate(a.reviewedAt)}
              {a.reviewedByName ? ` by ${a.reviewedByName}` : ''}
            </span>
          ) : (
            <span>Not reviewed yet</span>
          )}
          {a.authorName ? <span>Written by {a.authorName}</span> : null}
          <button type="button" className="no-print min-h-11 underline" onClick={() => window.print()}>
            Print
          </button>
        </div>
      </header>
      <CautionSummary articleId={a.id} hazards={shown.hazards} />
      <ArticleBody html={shown.html} />
      {shown.keywords.length ? <p className="mt-8 text-sm text-ink-soft">Keywords: {shown.keywords.join(', ')}</p> : null}
    </article>
  );
}
