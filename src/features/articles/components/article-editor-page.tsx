// Writing an article: title, summary, tags and the rich text, saved as the author types, with a
// clear saved / waiting state, a copy on this device and a way out of editing conflicts.
import { useMemo, useState } from 'react';
import { Link, useBlocker, useNavigate, useParams } from 'react-router';
import type { ArticleDetail } from '@/shared/schemas/articles';
import { EMPTY_DOC } from '@/shared/rich-text/extensions';
import { ApiError } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { LoadingBlock, Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { NotFoundPage } from '@/components/errors/route-error';
import { RichTextEditor } from '@/components/rich-text/rich-text-editor';
import { uploadFile, useArticle, useTags } from '../api/articles';
import { fieldsFrom, readBackup, useArticleDraft, type Backup, type DraftFields, type SaveStatus } from '../hooks/use-article-draft';
import { TagPicker } from '@/components/tags/tag-chips';
import { formatDateTime, formatTime } from '@/lib/format';

const STATUS_WORDS: Record<SaveStatus, string> = {
  saved: 'All changes saved',
  dirty: 'Unsaved changes…',
  saving: 'Saving…',
  offline: 'Waiting for a connection · kept on this device',
  error: 'Not saved',
  conflict: 'Someone else saved: choose what to keep',
};

export function ArticleEditorPage() {
  const params = useParams();
  const isNew = params.id === undefined;
  const id = isNew ? null : Number(params.id);
  const article = useArticle(id ?? 0, !isNew);
  if (isNew) return <Editor key="new" article={null} />;
  if (article.isPending) return <LoadingBlock label="Opening the editor" />;
  if (article.isError) {
    if (article.error instanceof ApiError && article.error.status === 404) return <NotFoundPage />;
    return (
      <Notice tone="error" title="The article could not be opened">
        Reload the page to try again.
      </Notice>
    );
  }
  return <Editor key={article.data.id} article={article.data} />;
}

function Editor({ article }: { article: ArticleDetail | null }) {
  const navigate = useNavigate();
  const tags = useTags();
  const initial: DraftFields = useMemo(() => (article ? fieldsFrom(article) : { title: '', summary: '', tags: [], keywords: '', body: EMPTY_DOC }), [article]);
  const [backup, setBackup] = useState<Backup | null>(() => {
    const b = readBackup(article?.id ?? 'new');
    if (!b) return null;
    const same = JSON.stringify({ ...initial }) === JSON.stringify({ title: b.title, summary: b.summary, tags: b.tags, keywords: b.keywords, body: b.body });
    return same ? null : b;
  });
  const draft = useArticleDraft({
    id: article?.id ?? null,
    initial,
    version: article?.version ?? null,
    onCreated: (a) => navigate(`/articles/${a.id}/edit`, { replace: true }),
  });
  const blocker = useBlocker(({ currentLocation, nextLocation }) => draft.unsaved && currentLocation.pathname !== nextLocation.pathname && !/\/articles\/\d+\/edit$/.test(nextLocation.pathname));
  const locked = article && (article.workflow === 'in_review' || article.workflow === 'archived');
  const { fields, update } = draft;

  if (locked) {
    return (
      <div className="mx-auto max-w-3xl">
        <Notice tone="warn" title={article.workflow === 'in_review' ? 'This article is waiting for review' : 'This article is archived'}>
          {article.workflow === 'in_review' ? 'Withdraw it from review on its page to edit it.' : 'Restore it from the archive on its page to edit it.'}{' '}
          <Link className="underline" to={`/articles/${article.id}`}>
            Open the article
          </Link>
        </Notice>
      </div>
    );
  }

  return (
    <div className="mx-auto max-w-4xl">
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-semibold">{article ? 'Edit article' : 'New article'}</h1>
        <p
          role="status"
          aria-live="polite"
          data-save-status={draft.status}
          className={`text-sm font-semibold ${draft.status === 'saved' ? 'text-fixed' : draft.status === 'error' || draft.status === 'conflict' ? 'text-danger' : 'text-ink-soft'}`}
        >
          {STATUS_WORDS[draft.status]}
          {draft.status === 'saved' && draft.lastSavedAt ? ` · ${formatTime(draft.lastSavedAt)}` : ''}
        </p>
      </div>

      {backup ? (
        <div className="mb-4">
          <Notice tone="warn" title="Unsaved text from this device">
            <p>On {formatDateTime(backup.savedAt)} you typed changes here that did not reach the server.</p>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button
                onClick={() => {
                  update({ title: backup.title, summary: backup.summary, tags: backup.tags, keywords: backup.keywords, body: backup.body });
                  setBackup(null);
                }}
              >
                Bring them back
              </Button>
              <Button
                variant="secondary"
                onClick={() => {
                  localStorage.removeItem(`beadpath.article-draft.${article?.id ?? 'new'}`);
                  setBackup(null);
                }}
              >
                Discard them
              </Button>
            </div>
          </Notice>
        </div>
      ) : null}

      {draft.message ? (
        <div className="mb-4">
          <Notice tone={draft.status === 'offline' ? 'warn' : 'error'} title={draft.message} />
        </div>
      ) : null}

      <div className="space-y-5">
        <TextField
          label="Title"
          value={fields.title}
          onChange={(e) => update({ title: e.target.value })}
          error={draft.fieldErrors.title}
          placeholder="e.g. Reading a worn seat under a loupe"
          maxLength={160}
        />
        <TextField
          label="Summary"
          value={fields.summary}
          onChange={(e) => update({ summary: e.target.value })}
          error={draft.fieldErrors.summary}
          hint="One or two sentences shown in lists and search."
          maxLength={400}
        />
        {tags.data ? <TagPicker legend="Tags" tags={tags.data} value={fields.tags} onChange={(t) => update({ tags: t })} /> : null}
        {draft.fieldErrors.tags ? <p className="text-sm font-semibold text-danger">{draft.fieldErrors.tags}</p> : null}
        <TextField
          label="Keywords"
          value={fields.keywords}
          onChange={(e) => update({ keywords: e.target.value })}
          error={draft.fieldErrors.keywords}
          hint="Separated by commas: words people might search for."
        />
        <div>
          <p className="mb-1 text-sm font-semibold" id="body-label">
            Text
          </p>
          <RichTextEditor
            label="Article text"
            value={fields.body}
            onChange={(body) => update({ body })}
            upload={async (file) => (await uploadFile(file)).urls.display}
            attach={async (file) => {
              const f = await uploadFile(file);
              return { href: f.urls.original, name: f.originalName.replace(/\.pdf$/i, '') };
            }}
          />
          {draft.fieldErrors.body ? <p className="mt-1 text-sm font-semibold text-danger">{draft.fieldErrors.body}</p> : null}
        </div>
      </div>

      <div className="sticky bottom-0 z-20 -mx-4 mt-6 flex flex-wrap justify-end gap-2 border-t border-rule bg-paper/95 px-4 py-3 backdrop-blur">
        {article ? (
          <Button variant="secondary" onClick={() => navigate(`/articles/${draft.articleId.current ?? article.id}`)}>
            Done
          </Button>
        ) : null}
        <Button busy={draft.status === 'saving'} onClick={() => void draft.save(false)}>
          {article || draft.articleId.current ? 'Save revision' : 'Create draft'}
        </Button>
      </div>

      <Dialog open={draft.conflict !== null} title="Someone else changed this article" onClose={() => undefined}>
        {draft.conflict ? (
          <div className="space-y-4">
            <p>
              {draft.conflict.revision.authorName ?? 'Another author'} saved revision {draft.conflict.revision.number} while you were editing. Nothing has been overwritten. Choose what to keep:
            </p>
            <div className="grid max-h-[50vh] gap-3 overflow-y-auto sm:grid-cols-2">
              <section className="rounded border border-rule p-3">
                <h3 className="font-semibold">Their text</h3>
                <div className="prose-bp mt-2 text-sm" dangerouslySetInnerHTML={{ __html: draft.conflict.revision.html }} />
              </section>
              <section className="rounded border border-amber-line p-3">
                <h3 className="font-semibold">Your text</h3>
                <p className="mt-2 text-sm font-semibold">{fields.title}</p>
                <p className="text-sm text-ink-soft">{fields.summary}</p>
              </section>
            </div>
            <div className="flex flex-wrap justify-end gap-2">
              <Button variant="secondary" onClick={() => void draft.resolveConflict('theirs')}>
                Use their text
              </Button>
              <Button variant="secondary" onClick={() => void draft.resolveConflict('both')}>
                Keep both
              </Button>
              <Button onClick={() => void draft.resolveConflict('mine')}>Save mine over theirs</Button>
            </div>
          </div>
        ) : null}
      </Dialog>

      <Dialog open={blocker.state === 'blocked'} title="Leave without saving?" onClose={() => blocker.reset?.()}>
        <p>Some changes have not reached the server yet. They are kept on this device and offered the next time you open this article.</p>
        <div className="mt-4 flex justify-end gap-2">
          <Button variant="secondary" onClick={() => blocker.reset?.()}>
            Stay and save
          </Button>
          <Button variant="danger" onClick={() => blocker.proceed?.()}>
            Leave
          </Button>
        </div>
      </Dialog>
    </div>
  );
}
