// The full results page (/search?q=…) with filters by actuation, component and fluid, and the
// admin's search engine page (/admin/search): what answers, how big the indexes are, the queue,
// synonyms and a rebuild.
import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router';
import { TAG_GROUPS, TAG_GROUP_LABELS, type TagGroup } from '@/shared/tags';
import type { SearchEngineName } from '@/shared/schemas/search';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useTags } from '@/lib/tags';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { LoadingBlock, Notice, ProgressBar, Skeleton } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { Card, PageHeader } from '@/components/ui/page';
import { useReindex, useSaveSynonyms, useSearch, useSearchStatus, useSynonyms, type SearchParams } from '../api/search';
import { useDebouncedValue } from '../hooks/use-debounced-value';
import { CorrectedNote, GroupedResults, NothingFound } from './search-results';
import { formatDateTime, formatInteger } from '@/lib/format';

const ENGINE_LABELS: Record<SearchEngineName, string> = { postgres: 'PostgreSQL', meilisearch: 'Meilisearch' };
const KINDS = [
  { value: 'all', label: 'All' },
  { value: 'guide', label: 'Guides' },
  { value: 'article', label: 'Articles' },
] as const;

export function SearchPage() {
  const [params, setParams] = useSearchParams();
  const [text, setText] = useState(params.get('q') ?? '');
  const tags = useTags();
  const q = useDebouncedValue(text.trim(), 250);
  const kind = (params.get('kind') as SearchParams['kind']) ?? 'all';
  const facet = (g: TagGroup) => params.get(g) ?? '';
  const query: SearchParams = { q, kind, actuation: facet('actuation'), component: facet('component'), fluid: facet('fluid') };
  const results = useSearch(query);

  // The address follows the box, so a search can be shared or reloaded; history is not flooded.
  useEffect(() => {
    if ((params.get('q') ?? '') === q) return;
    const next = new URLSearchParams(params);
    if (q) next.set('q', q);
    else next.delete('q');
    setParams(next, { replace: true });
  }, [q]);

  // Arriving from the header box with a new query replaces what is typed here.
  const fromUrl = params.get('q') ?? '';
  useEffect(() => {
    if (fromUrl !== q) setText(fromUrl);
  }, [fromUrl]);

  const setParam = (key: string, value: string) => {
    const next = new URLSearchParams(params);
    if (value && value !== 'all') next.set(key, value);
    else next.delete(key);
    setParams(next, { replace: true });
  };
  const anyFilter = TAG_GROUPS.some((g) => facet(g));

  return (
    <div>
      <PageHeader title="Search" lead="Guides and articles, in your words. Misspellings and trade synonyms are understood." />
      <form role="search" onSubmit={(e) => e.preventDefault()} className="space-y-3">
        <label className="relative block">
          <span className="sr-only">Search guides and articles</span>
          <Icon.search className="pointer-events-none absolute left-3 top-1/2 size-6 -translate-y-1/2 text-ink-faint" aria-hidden />
          <input
            type="search"
            value={text}
            onChange={(e) => setText(e.target.value)}
            placeholder="What are you seeing, or what do you need?"
            autoComplete="off"
            enterKeyHint="search"
            maxLength={200}
            className="block min-h-12 w-full rounded-lg border-2 border-rule-strong bg-paper-raised pl-12 pr-4 text-lg placeholder:text-ink-faint focus:border-amber"
          />
        </label>
        <fieldset className="flex flex-wrap gap-2">
          <legend className="sr-only">Show</legend>
          {KINDS.map((k) => (
            <button
              key={k.value}
              type="button"
              aria-pressed={kind === k.value}
              onClick={() => setParam('kind', k.value)}
              className={`min-h-11 rounded-full border px-4 ${kind === k.value ? 'border-amber bg-amber-wash font-semibold text-amber-deep' : 'border-rule-strong bg-paper-raised'}`}
            >
              {k.label}
            </button>
          ))}
        </fieldset>
        <div className="grid grid-cols-3 gap-2">
          {TAG_GROUPS.map((g) => (
            <SelectField key={g} label={TAG_GROUP_LABELS[g]} value={facet(g)} onChange={(e) => setParam(g, e.target.value)}>
              <option value="">Any</option>
              {(tags.data ?? [])
                .filter((t) => t.group === g && t.active)
                .map((t) => (
                  <option key={t.slug} value={t.slug}>
                    {t.label}
                  </option>
                ))}
            </SelectField>
          ))}
        </div>
      </form>

      <div className="mt-6 space-y-3" aria-live="polite">
        {!q && !anyFilter ? (
          <p className="text-ink-soft">Type a symptom (“drips after shutoff”), a part (“coil”), or a question. Press / anywhere to search.</p>
        ) : results.isError ? (
          <Notice tone="error" title="Search did not work">
            {results.error instanceof ApiError ? results.error.message : errorMessage(results.error)}
          </Notice>
        ) : !results.data ? (
          <div className="space-y-2" role="status" aria-label="Searching">
            <Skeleton className="h-16 w-full" />
            <Skeleton className="h-16 w-full" />
          </div>
        ) : results.data.results.length ? (
          <div className={`space-y-3 ${results.isPlaceholderData ? 'opacity-70' : ''}`}>
            <p className="text-sm text-ink-soft">
              {results.data.total} found · answered by {ENGINE_LABELS[results.data.engine]}
              {results.data.fallback ? ' (the search server did not answer in time)' : ''}
            </p>
            <CorrectedNote data={results.data} />
            <GroupedResults data={results.data} />
          </div>
        ) : (
          <NothingFound query={q} suggestions={results.data.suggestions} onPick={(s) => setText(s)} />
        )}
      </div>
    </div>
  );
}

function SynonymEditor() {
  const synonyms = useSynonyms();
  const save = useSaveSynonyms();
  const [rows, setRows] = useState<string[] | null>(null);
  useEffect(() => {
    if (synonyms.data && rows === null) setRows(synonyms.data.map((g) => g.join(', ')));
  }, [synonyms.data, rows]);
  if (synonyms.isPending || !rows) return <LoadingBlock label="Loading synonyms" />;
  if (synonyms.isError) return <Notice tone="error" title="Synonyms could not be loaded" />;
  const fields = save.error instanceof ApiError ? save.error.fields : {};
  const groups = () =>
    rows
      .map((r) =>
        r
          .split(',')
          .map((t) => t.trim())
          .filter(Boolean),
      )
      .filter((g) => g.length);

  return (
    <Card>
      <h2 className="text-lg font-semibold">Trade synonyms</h2>
      <p className="mt-1 text-ink-soft">Words on one line mean the same thing in a search, with both engines: a technician who types “drool” finds guides about drips.</p>
      <ul className="mt-3 space-y-2">
        {rows.map((r, i) => {
          const error = Object.entries(fields).find(([k]) => k.startsWith(`groups.${i}.`) || k === `groups.${i}`)?.[1];
          return (
            <li key={i}>
              <div className="flex gap-2">
                <input
                  aria-label={`Synonym group ${i + 1}`}
                  aria-invalid={error ? true : undefined}
                  value={r}
                  onChange={(e) => setRows(rows.map((x, k) => (k === i ? e.target.value : x)))}
                  className="min-h-11 flex-1 rounded-md border border-rule-strong bg-paper-raised px-3 aria-[invalid=true]:border-danger"
                />
                <Button variant="secondary" aria-label={`Remove synonym group ${i + 1}`} onClick={() => setRows(rows.filter((_, k) => k !== i))}>
                  <Icon.close />
                </Button>
              </div>
              {error ? <p className="mt-1 text-sm font-semibold text-danger">{error}</p> : null}
            </li>
          );
        })}
      </ul>
      <div className="mt-3 flex flex-wrap gap-2">
        <Button variant="secondary" onClick={() => setRows([...rows, ''])}>
          Add a group
        </Button>
        <Button
          busy={save.isPending}
          onClick={() =>
            save.mutate(groups(), {
              onSuccess: (saved) => {
                setRows(saved.map((g) => g.join(', ')));
                showToast('Synonyms saved', 'ok');
              },
            })
          }
        >
          Save synonyms
        </Button>
      </div>
      {save.isError && !Object.keys(fields).length ? <p className="mt-2 text-sm font-semibold text-danger">{errorMessage(save.error)}</p> : null}
    </Card>
  );
}

const when = (iso: string | null) => (iso ? formatDateTime(iso) : 'never');
const kb = (bytes: number) => `${formatInteger(bytes / 1024)} kB`;

/** A rebuild being followed: how many items were queued and the most done so far. */
interface Rebuild {
  queued: number;
  done: number;
  finished: boolean;
}

export function SearchAdminPage() {
  const [rebuild, setRebuild] = useState<Rebuild | null>(null);
  const following = rebuild !== null && !rebuild.finished;
  const status = useSearchStatus(following ? 1000 : 5000);
  const reindex = useReindex();
  const s = status.data;
  const pending = s ? s.jobs.reduce((n, j) => n + j.pending, 0) : null;
  // Progress from the queue: what was queued minus what still waits (never going backwards).
  useEffect(() => {
    if (!following || pending === null || status.isFetching) return;
    setRebuild((r) => (r && !r.finished ? { ...r, done: Math.max(r.done, r.queued - pending), finished: pending === 0 } : r));
  }, [following, pending, status.isFetching, status.dataUpdatedAt]);
  return (
    <div className="space-y-4">
      <PageHeader
        title="Search engine"
        lead="What answers searches, how much is indexed, and the queue that keeps it current."
        actions={
          <Button
            variant="secondary"
            busy={reindex.isPending || following}
            onClick={() =>
              reindex.mutate(undefined, {
                onSuccess: (r) => {
                  showToast(`${formatInteger(r.queued)} items queued for indexing`, 'ok');
                  setRebuild({ queued: r.queued, done: 0, finished: r.queued === 0 });
                },
              })
            }
          >
            Rebuild the index
          </Button>
        }
      />
      {rebuild ? (
        <Card>
          <div role="status" data-reindex-progress={rebuild.finished ? 'done' : 'running'}>
            {rebuild.finished ? (
              <p className="font-semibold text-fixed">✓ Index rebuilt: {formatInteger(rebuild.queued)} items indexed.</p>
            ) : (
              <ProgressBar label={`Rebuilding the index: ${formatInteger(rebuild.done)} of ${formatInteger(rebuild.queued)} items`} value={rebuild.queued ? rebuild.done / rebuild.queued : null} />
            )}
          </div>
        </Card>
      ) : null}
      {status.isPending ? (
        <LoadingBlock label="Loading the engine's state" />
      ) : status.isError || !s ? (
        <Notice tone="error" title="The engine's state could not be loaded" />
      ) : (
        <div className="grid gap-4 lg:grid-cols-2">
          <Card>
            <h2 className="text-lg font-semibold">Engine</h2>
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
              <dt className="text-ink-soft">Configured</dt>
              <dd className="font-semibold">{ENGINE_LABELS[s.configured]}</dd>
              <dt className="text-ink-soft">Answering now</dt>
              <dd className="font-semibold" data-answering={s.answering}>
                {ENGINE_LABELS[s.answering]}
              </dd>
              <dt className="text-ink-soft">Last sync</dt>
              <dd>{when(s.lastSyncAt)}</dd>
              <dt className="text-ink-soft">Last change picked up</dt>
              <dd>{when(s.lastChangeAt)}</dd>
            </dl>
            {s.meili && !s.meili.healthy ? (
              <div className="mt-3">
                <Notice tone="warn" title={`Meilisearch is failing since ${when(s.meili.failingSince)}`}>
                  PostgreSQL answers every search until it is back; its updates wait in the queue. {s.meili.lastError}
                </Notice>
              </div>
            ) : null}
            {s.meili ? <p className="mt-2 text-sm text-ink-soft">Meilisearch incidents since start: {s.meili.incidents}</p> : null}
          </Card>
          <Card>
            <h2 className="text-lg font-semibold">Indexes</h2>
            <table className="mt-2 w-full text-left">
              <thead>
                <tr className="border-b border-rule text-sm text-ink-soft">
                  <th className="py-1 font-semibold">Index</th>
                  <th className="py-1 text-right font-semibold">Items</th>
                </tr>
              </thead>
              <tbody className="tabular">
                <tr>
                  <td className="py-1">PostgreSQL guides</td>
                  <td className="py-1 text-right">{s.postgres.guides}</td>
                </tr>
                <tr>
                  <td className="py-1">PostgreSQL articles</td>
                  <td className="py-1 text-right">{s.postgres.articles}</td>
                </tr>
                <tr>
                  <td className="py-1">Words for typo tolerance</td>
                  <td className="py-1 text-right">{s.postgres.words}</td>
                </tr>
                <tr>
                  <td className="py-1">PostgreSQL table size</td>
                  <td className="py-1 text-right">{kb(s.postgres.tableBytes)}</td>
                </tr>
                {s.meili?.indexes.map((i) => (
                  <tr key={i.uid}>
                    <td className="py-1 break-all">Meilisearch {i.uid}</td>
                    <td className="py-1 text-right">{i.documents ?? '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
          <Card className="lg:col-span-2">
            <h2 className="text-lg font-semibold">Queue</h2>
            <ul className="mt-2 space-y-1">
              {s.jobs.map((j) => (
                <li key={j.target}>
                  <span className="font-semibold">{ENGINE_LABELS[j.target]}</span>: {j.pending} waiting, {j.failed} given up
                  {j.lastError ? <span className="block text-sm text-danger">Last error: {j.lastError}</span> : null}
                </li>
              ))}
            </ul>
          </Card>
        </div>
      )}
      <SynonymEditor />
    </div>
  );
}
