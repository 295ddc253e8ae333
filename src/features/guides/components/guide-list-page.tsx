// Guides: authors see every guide with its state, problems and feedback; everyone else the
// published guides by symptom, one tap from a walk.
import { useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { GuideMetaInput } from '@/shared/schemas/guides';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { useCan } from '@/lib/auth';
import { useTags } from '@/lib/tags';
import { ApiError, errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { Button, ButtonLink } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState, ListSkeleton, Notice, ProgressBar, StageList } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page';
import { TagList } from '@/components/tags/tag-chips';
import type { GuideListItem } from '@/shared/schemas/guides';
import { useCreateGuide, useGuides, useImportGuide } from '../api/guides';
import { formatDate } from '@/lib/format';

const TABS = [
  { key: 'all', label: 'All' },
  { key: 'review-queue', label: 'Waiting for my review' },
  { key: 'draft', label: 'Being edited' },
  { key: 'published', label: 'Published' },
  { key: 'retired', label: 'Retired' },
];

function stateWords(g: GuideListItem): { text: string; tone: string } {
  if (g.status === 'retired') return { text: 'Retired', tone: 'bg-paper-sunk text-ink-soft' };
  if (g.draftState === 'in_review') return { text: g.publishedVersion ? `v${g.publishedVersion} published · changes in review` : 'In review', tone: 'bg-amber-wash text-amber-deep' };
  if (g.draftState === 'draft') return { text: g.publishedVersion ? `v${g.publishedVersion} published · changes in draft` : 'Draft', tone: 'bg-paper-sunk text-ink-soft' };
  return { text: `Published v${g.publishedVersion}`, tone: 'bg-fixed-wash text-fixed' };
}

const NewGuideForm = GuideMetaInput.pick({ title: true, symptom: true });
type NewGuideForm = z.input<typeof NewGuideForm>;

function NewGuideDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const create = useCreateGuide();
  const navigate = useNavigate();
  // The same schema the server validates with, so the form says what the server would.
  const form = useForm<NewGuideForm, unknown, z.output<typeof NewGuideForm>>({ resolver: zodResolver(NewGuideForm), defaultValues: { title: '', symptom: '' } });
  const submit = form.handleSubmit((values) =>
    create.mutate(
      { ...values, summary: '', tags: [] },
      {
        onSuccess: (g) => navigate(`/guides/${g.id}/edit`),
        onError: (err) => {
          if (err instanceof ApiError) for (const [k, v] of Object.entries(err.fields)) form.setError(k as keyof NewGuideForm, { message: v });
        },
      },
    ),
  );
  const errors = form.formState.errors;
  return (
    <Dialog open={open} title="New guide" onClose={onClose}>
      <form onSubmit={submit} noValidate className="space-y-4">
        {create.isError && !Object.keys(errors).length ? <Notice tone="error" title={errorMessage(create.error)} /> : null}
        <TextField label="Symptom it starts from" {...form.register('symptom')} error={errors.symptom?.message} placeholder="Drips after the valve closes" autoFocus />
        <TextField label="Title" {...form.register('title')} error={errors.title?.message} placeholder="Drips after close on electric valves" />
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={create.isPending}>
            Create and edit
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function ImportButton() {
  const imp = useImportGuide();
  const navigate = useNavigate();
  const input = useRef<HTMLInputElement>(null);
  const [problems, setProblems] = useState<{ path: string; message: string }[] | null>(null);
  const [sent, setSent] = useState(0);
  return (
    <>
      <Button variant="secondary" onClick={() => input.current?.click()} busy={imp.isPending}>
        Import a guide file
      </Button>
      <input
        ref={input}
        type="file"
        accept="application/json,.json"
        className="hidden"
        aria-label="Guide file to import"
        onChange={async (e) => {
          const file = e.target.files?.[0];
          e.target.value = '';
          if (!file) return;
          let json: object;
          try {
            json = JSON.parse(await file.text());
            if (!json || typeof json !== 'object') throw new Error('not an object');
          } catch {
            setProblems([{ path: '(file)', message: 'This file is not JSON. Export a guide from Beadpath and import that file.' }]);
            return;
          }
          setSent(0);
          imp.mutate(
            { file: json, onProgress: setSent },
            {
              onSuccess: (r) => {
                showToast(`Imported “${r.guide.draft?.meta.title ?? 'guide'}” as a draft${r.causesAdded.length ? `; new causes: ${r.causesAdded.join(', ')}` : ''}`, 'ok');
                navigate(`/guides/${r.guide.id}/edit`);
              },
              onError: (err) =>
                setProblems(
                  err instanceof ApiError && Array.isArray(err.details?.problems) ? (err.details!.problems as { path: string; message: string }[]) : [{ path: '(file)', message: errorMessage(err) }],
                ),
            },
          );
        }}
      />
      <Dialog open={imp.isPending} title="Importing the guide" onClose={() => undefined}>
        <div className="space-y-3" data-import-progress="guide">
          <StageList label="Importing the guide" stages={['Read the file on this device', 'Send it', 'Check every step and keep it as a draft']} current={sent < 1 ? 1 : 2} />
          <ProgressBar label={sent < 1 ? 'Sending the file' : 'Checking every step'} value={sent < 1 ? sent : null} />
        </div>
      </Dialog>
      <Dialog open={problems !== null} title="The file could not be imported" onClose={() => setProblems(null)}>
        <p className="mb-2">Nothing was imported. Fix these in the file and try again:</p>
        <ul className="max-h-80 space-y-1 overflow-y-auto text-sm">
          {problems?.map((p, i) => (
            <li key={i}>
              <code className="rounded bg-paper-sunk px-1">{p.path}</code> {p.message}
            </li>
          ))}
        </ul>
        <div className="mt-4 flex justify-end">
          <Button onClick={() => setProblems(null)}>Close</Button>
        </div>
      </Dialog>
    </>
  );
}

export function GuideListPage() {
  const isAuthor = useCan('guides:write');
  const [params, setParams] = useSearchParams();
  const tab = params.get('tab') ?? 'all';
  const tag = params.get('tag') ?? '';
  const [q, setQ] = useState(params.get('q') ?? '');
  const [creating, setCreating] = useState(false);
  const tags = useTags();
  const list = useGuides({ status: isAuthor ? tab : undefined, tag: tag || undefined, q: params.get('q') || undefined });
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };

  return (
    <div>
      <PageHeader
        title="Guides"
        lead="Troubleshooting guides from a symptom to its cause and remedy."
        actions={
          isAuthor ? (
            <>
              <Button onClick={() => setCreating(true)}>New guide</Button>
              <ImportButton />
            </>
          ) : null
        }
      />
      <NewGuideDialog open={creating} onClose={() => setCreating(false)} />
      {isAuthor ? (
        <div role="tablist" aria-label="Which guides" className="-mx-1 mb-4 flex gap-1 overflow-x-auto pb-1">
          {TABS.map((t) => (
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
        <TextField label="Find a guide" type="search" className="min-w-56 flex-1" value={q} onChange={(e) => setQ(e.target.value)} placeholder="drips, coil, placement…" />
        <div>
          <label htmlFor="guide-tag" className="mb-1 block text-sm font-semibold">
            Tag
          </label>
          <select id="guide-tag" className="min-h-11 rounded-md border border-rule-strong bg-paper-raised px-3" value={tag} onChange={(e) => set('tag', e.target.value)}>
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
        <ListSkeleton label="Loading guides" />
      ) : list.isError ? (
        <Notice tone="error" title="Guides could not be loaded">
          {errorMessage(list.error)}
        </Notice>
      ) : list.data.length === 0 ? (
        <EmptyState
          title={params.get('q') || tag ? 'No guide matches' : 'No guides here'}
          action={
            params.get('q') || tag ? (
              <Button
                variant="secondary"
                onClick={() => {
                  setQ('');
                  setParams(new URLSearchParams(tab === 'all' ? {} : { tab }), { replace: true });
                }}
              >
                Clear the search
              </Button>
            ) : isAuthor ? (
              <Button onClick={() => setCreating(true)}>New guide</Button>
            ) : (
              <ButtonLink to="/search" variant="secondary">
                Search articles instead
              </ButtonLink>
            )
          }
        >
          {params.get('q') || tag
            ? 'Try fewer or other words, or another tag.'
            : isAuthor
              ? 'Start one with “New guide”, or import a guide file from another site.'
              : 'No guide has been published yet. Articles may still help; ask an author to publish the guide you need.'}
        </EmptyState>
      ) : (
        <ul className="space-y-3">
          {list.data.map((g) => {
            const s = stateWords(g);
            return (
              <li key={g.id} className="rounded-lg border border-rule bg-paper-raised p-4">
                <div className="flex flex-wrap items-start justify-between gap-2">
                  <div>
                    <p className="text-sm font-semibold text-amber-deep">{g.symptom}</p>
                    <h2 className="text-lg font-semibold">
                      <Link to={`/guides/${g.id}`} className="inline-flex min-h-11 items-center hover:underline">
                        {g.title}
                      </Link>
                    </h2>
                  </div>
                  {isAuthor ? <span className={`rounded px-2 py-0.5 text-xs font-semibold ${s.tone}`}>{s.text}</span> : null}
                </div>
                {g.summary ? <p className="mt-1 text-ink-soft">{g.summary}</p> : null}
                <div className="mt-2 flex flex-wrap items-center gap-3 text-sm text-ink-soft">
                  <TagList slugs={g.tags} tags={tags.data ?? []} />
                  {isAuthor && g.errorCount ? <span className="font-semibold text-danger-deep">{g.errorCount} to fix</span> : null}
                  {isAuthor && g.openFlagCount ? <span className="text-amber-deep">⚑ {g.openFlagCount} flagged steps</span> : null}
                  {isAuthor && g.walksNotFixed + g.walksFixedByOther ? (
                    <span>
                      {g.walksNotFixed} not fixed · {g.walksFixedByOther} fixed another way
                    </span>
                  ) : null}
                  {isAuthor && g.draftUpdatedAt ? (
                    <span>
                      Changed {formatDate(g.draftUpdatedAt)}
                      {g.draftUpdatedByName ? ` by ${g.draftUpdatedByName}` : ''}
                    </span>
                  ) : null}
                </div>
                {!isAuthor && g.publishedVersion ? (
                  <div className="mt-3">
                    <ButtonLink to={`/guides/${g.id}/walk`}>Start walk</ButtonLink>
                  </div>
                ) : null}
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}
