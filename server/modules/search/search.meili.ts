// The Meilisearch engine: per-organisation indexes for guides, their steps and articles, with
// settings kept in code; document pushes for the sync job; searches bounded by MEILI_TIMEOUT_MS;
// and the health tracker that turns failures into one logged incident and a PostgreSQL fallback.
import { Meilisearch, MeilisearchApiError, type EnqueuedTaskPromise, type Settings } from 'meilisearch';
import type { Logger } from 'pino';
import type { SearchHit, SearchKind } from '../../../src/shared/schemas/search';
import { MARK_CLOSE, MARK_OPEN, type SearchSource } from './search.documents';
import { markedHtml } from './search.text';

/** While Meilisearch is failing, searches go straight to PostgreSQL and it is tried again after this. */
export const MEILI_RETRY_MS = 5000;

export type IndexName = 'guides' | 'steps' | 'articles';
export const INDEX_NAMES: IndexName[] = ['guides', 'steps', 'articles'];

export function indexUid(organisationId: number, name: IndexName) {
  return `beadpath-org${organisationId}-${name}`;
}

const FILTERABLE = ['organisationId', 'state', 'tags', 'actuation', 'component', 'fluid'];
const SETTINGS: Record<IndexName, Settings> = {
  guides: {
    searchableAttributes: ['title', 'symptom', 'keywords', 'summary', 'body'],
    filterableAttributes: FILTERABLE,
    sortableAttributes: ['publishedAt', 'title'],
  },
  steps: {
    searchableAttributes: ['title', 'guideSymptom', 'text', 'guideTitle'],
    filterableAttributes: [...FILTERABLE, 'guideId'],
    sortableAttributes: ['guideId'],
  },
  articles: {
    searchableAttributes: ['title', 'keywords', 'summary', 'body'],
    filterableAttributes: FILTERABLE,
    sortableAttributes: ['publishedAt', 'title'],
  },
};

/** Failures become incidents: logged when they start and when they end, never per request. */
export class MeiliHealth {
  failingSince: Date | null = null;
  lastError: string | null = null;
  incidents = 0;
  private retryAt = 0;

  constructor(
    private readonly logger: Logger,
    private readonly onRecover: () => Promise<void> | void,
    private readonly retryMs = MEILI_RETRY_MS,
  ) {}

  get failing() {
    return this.failingSince !== null;
  }

  /** Whether to try Meilisearch now: always when healthy, once per retry period while failing. */
  shouldTry(now = Date.now()) {
    return !this.failing || now >= this.retryAt;
  }

  failure(err: unknown, during: string) {
    this.lastError = describe(err);
    this.retryAt = Date.now() + this.retryMs;
    if (this.failing) return;
    this.failingSince = new Date();
    this.incidents++;
    this.logger.warn({ during, error: this.lastError }, 'Meilisearch is failing; searches are answered from PostgreSQL until it recovers');
  }

  async success() {
    if (!this.failing) return;
    const downMs = Date.now() - this.failingSince!.getTime();
    this.failingSince = null;
    this.logger.info({ downMs }, 'Meilisearch answers again; replaying the updates it missed');
    await this.onRecover();
  }
}

export function describe(err: unknown): string {
  if (err instanceof MeilisearchApiError) return `${err.cause?.code ?? err.response.status}: ${err.message}`;
  if (err instanceof Error) {
    const cause = (err as { cause?: unknown }).cause;
    return cause instanceof Error ? `${err.message} (${cause.message})` : err.message;
  }
  return String(err);
}

export function isIndexMissing(err: unknown) {
  return err instanceof MeilisearchApiError && err.cause?.code === 'index_not_found';
}

function synonymsSetting(groups: string[][]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const g of groups) {
    const terms = g.map((t) => t.toLowerCase());
    for (const t of terms) out[t] = [...new Set([...(out[t] ?? []), ...terms.filter((o) => o !== t)])];
  }
  return out;
}

const BODY_LIMIT = 20_000;

function guideDoc(s: SearchSource) {
  return {
    id: s.refId,
    organisationId: s.organisationId,
    state: 'published',
    version: s.version,
    title: s.title,
    symptom: s.symptom,
    summary: s.summary,
    tags: s.tags,
    ...s.facets,
    keywords: s.headWords,
    body: s.body.slice(0, BODY_LIMIT),
    publishedAt: s.publishedAt?.getTime() ?? 0,
  };
}

function stepDocs(s: SearchSource) {
  return s.steps.map((step) => ({
    id: `${s.refId}-${step.id}`,
    guideId: s.refId,
    organisationId: s.organisationId,
    state: 'published',
    title: step.title,
    text: step.text.slice(0, BODY_LIMIT),
    guideTitle: s.title,
    guideSymptom: s.symptom,
    tags: s.tags,
    ...s.facets,
  }));
}

function articleDoc(s: SearchSource) {
  return {
    id: s.refId,
    organisationId: s.organisationId,
    state: 'published',
    version: s.version,
    title: s.title,
    summary: s.summary,
    tags: s.tags,
    ...s.facets,
    keywords: s.headWords,
    body: s.body.slice(0, BODY_LIMIT),
    publishedAt: s.publishedAt?.getTime() ?? 0,
  };
}

export interface MeiliQuery {
  organisationId: number;
  q: string;
  kind: 'all' | SearchKind;
  facets: { actuation?: string; component?: string; fluid?: string };
  limit: number;
}

type Hit = Record<string, unknown> & { _formatted?: Record<string, unknown>; _rankingScore?: number };

const str = (v: unknown) => (typeof v === 'string' ? v : '');
const hasMark = (v: unknown) => typeof v === 'string' && v.includes(MARK_OPEN);

function snippetOf(hit: Hit, fields: string[]): string {
  const f = hit._formatted ?? {};
  const marked = fields.find((k) => hasMark(f[k]));
  const text = marked ? str(f[marked]) : (fields.map((k) => str(f[k] ?? hit[k])).find(Boolean) ?? '');
  return markedHtml(text.length > 400 ? `${text.slice(0, 400)}…` : text);
}

export function createMeiliEngine(opts: { url: string; apiKey: string; timeoutMs: number }) {
  // Searches must give up quickly so PostgreSQL can still answer in time; indexing may wait.
  const searchClient = new Meilisearch({ host: opts.url, apiKey: opts.apiKey, timeout: opts.timeoutMs, clientAgents: ['Beadpath'] });
  const indexClient = new Meilisearch({ host: opts.url, apiKey: opts.apiKey, timeout: 15_000, clientAgents: ['Beadpath'], defaultWaitOptions: { timeout: 15_000, interval: 25 } });
  const ready = new Set<number>();

  async function wait(tasks: EnqueuedTaskPromise[]) {
    for (const t of tasks) {
      const done = await t.waitTask();
      if (done.status !== 'succeeded') throw new Error(`Meilisearch task ${done.uid} ${done.status}: ${done.error?.message ?? 'no reason given'}`);
    }
  }

  async function configure(organisationId: number, synonyms: string[][]) {
    for (const name of INDEX_NAMES) {
      const created = await indexClient.createIndex(indexUid(organisationId, name), { primaryKey: 'id' }).waitTask();
      if (created.status !== 'succeeded' && created.error?.code !== 'index_already_exists') {
        throw new Error(`Meilisearch could not create ${indexUid(organisationId, name)}: ${created.error?.message}`);
      }
    }
    await wait(INDEX_NAMES.map((name) => indexClient.index(indexUid(organisationId, name)).updateSettings({ ...SETTINGS[name], synonyms: synonymsSetting(synonyms) })));
    ready.add(organisationId);
  }

  function filterFor(q: MeiliQuery) {
    const parts = [`organisationId = ${Number(q.organisationId)}`, `state = "published"`];
    // Facet values passed the route's slug check: lower-case letters, digits and hyphens only.
    for (const key of ['actuation', 'component', 'fluid'] as const) if (q.facets[key]) parts.push(`${key} = "${q.facets[key]}"`);
    return parts.join(' AND ');
  }

  return {
    url: opts.url,

    /** Creates the organisation's indexes and applies settings (synonyms included). */
    configure,

    async ensure(organisationId: number, synonyms: () => Promise<string[][]>) {
      if (!ready.has(organisationId)) await configure(organisationId, await synonyms());
    },

    async probe() {
      await searchClient.health();
    },

    /** Applies one batch for one organisation: published sources replace their documents, gone ones are removed. */
    async apply(organisationId: number, visible: SearchSource[], gone: { kind: SearchKind; refId: number }[]) {
      const idx = (n: IndexName) => indexClient.index(indexUid(organisationId, n));
      const tasks: EnqueuedTaskPromise[] = [];
      const guides = visible.filter((s) => s.kind === 'guide');
      const articles = visible.filter((s) => s.kind === 'article');
      const touchedGuides = [...guides.map((g) => g.refId), ...gone.filter((g) => g.kind === 'guide').map((g) => g.refId)];
      // A new version may have fewer steps: clear the guide's steps before adding the current ones.
      if (touchedGuides.length) tasks.push(idx('steps').deleteDocuments({ filter: `guideId IN [${touchedGuides.join(', ')}]` }));
      if (guides.length) {
        tasks.push(idx('guides').addDocuments(guides.map(guideDoc)));
        const steps = guides.flatMap(stepDocs);
        if (steps.length) tasks.push(idx('steps').addDocuments(steps));
      }
      if (articles.length) tasks.push(idx('articles').addDocuments(articles.map(articleDoc)));
      const goneGuides = gone.filter((g) => g.kind === 'guide').map((g) => g.refId);
      const goneArticles = gone.filter((g) => g.kind === 'article').map((g) => g.refId);
      if (goneGuides.length) tasks.push(idx('guides').deleteDocuments(goneGuides));
      if (goneArticles.length) tasks.push(idx('articles').deleteDocuments(goneArticles));
      await wait(tasks);
    },

    /** Empties the organisation's indexes: the start of a full rebuild. */
    async clear(organisationId: number) {
      await wait(INDEX_NAMES.map((n) => indexClient.index(indexUid(organisationId, n)).deleteAllDocuments()));
    },

    async stats(organisationId: number) {
      return Promise.all(
        INDEX_NAMES.map(async (n) => {
          const uid = indexUid(organisationId, n);
          try {
            return { uid, documents: (await searchClient.index(uid).getStats()).numberOfDocuments };
          } catch {
            return { uid, documents: null };
          }
        }),
      );
    },

    async search(q: MeiliQuery): Promise<{ hits: SearchHit[]; total: number; guidesFirst: boolean }> {
      const filter = filterFor(q);
      const common = {
        q: q.q,
        filter,
        limit: q.limit,
        attributesToHighlight: ['title'],
        attributesToCrop: ['symptom', 'summary', 'body', 'text'],
        cropLength: 24,
        highlightPreTag: MARK_OPEN,
        highlightPostTag: MARK_CLOSE,
        showRankingScore: true,
      };
      const wanted: IndexName[] = q.kind === 'article' ? ['articles'] : q.kind === 'guide' ? ['guides', 'steps'] : INDEX_NAMES;
      const res = await searchClient.multiSearch({ queries: wanted.map((n) => ({ indexUid: indexUid(q.organisationId, n), ...common })) });
      const byIndex = new Map<IndexName, { hits: Hit[]; estimatedTotalHits?: number }>();
      wanted.forEach((n, i) => byIndex.set(n, res.results[i] as unknown as { hits: Hit[]; estimatedTotalHits?: number }));

      const guideHits = byIndex.get('guides')?.hits ?? [];
      const guidesFirst = guideHits.some((h) => hasMark(h._formatted?.symptom));
      const boost = (kind: SearchKind) => (guidesFirst && kind === 'guide' ? 2 : 1);
      const hits: SearchHit[] = [];
      const seenGuides = new Set<number>();
      for (const h of guideHits) {
        seenGuides.add(Number(h.id));
        hits.push({
          kind: 'guide',
          id: Number(h.id),
          title: str(h.title),
          titleHtml: markedHtml(str(h._formatted?.title ?? h.title)),
          symptom: str(h.symptom),
          snippetHtml: snippetOf(h, ['symptom', 'summary', 'body']),
          tags: (h.tags as string[]) ?? [],
          score: (h._rankingScore ?? 0) * boost('guide'),
          step: null,
        });
      }
      for (const h of byIndex.get('steps')?.hits ?? []) {
        const guideId = Number(h.guideId);
        if (seenGuides.has(guideId)) continue;
        seenGuides.add(guideId);
        hits.push({
          kind: 'guide',
          id: guideId,
          title: str(h.guideTitle),
          titleHtml: markedHtml(str(h.guideTitle)),
          symptom: str(h.guideSymptom),
          snippetHtml: snippetOf(h, ['text', 'title']),
          tags: (h.tags as string[]) ?? [],
          score: (h._rankingScore ?? 0) * 0.9 * boost('guide'),
          step: { id: String(h.id).slice(String(guideId).length + 1), title: str(h.title) },
        });
      }
      for (const h of byIndex.get('articles')?.hits ?? []) {
        hits.push({
          kind: 'article',
          id: Number(h.id),
          title: str(h.title),
          titleHtml: markedHtml(str(h._formatted?.title ?? h.title)),
          symptom: null,
          snippetHtml: snippetOf(h, ['summary', 'body']),
          tags: (h.tags as string[]) ?? [],
          score: h._rankingScore ?? 0,
          step: null,
        });
      }
      hits.sort((a, b) => b.score - a.score);
      const total = (byIndex.get('guides')?.estimatedTotalHits ?? 0) + (byIndex.get('articles')?.estimatedTotalHits ?? 0);
      return { hits: hits.slice(0, q.limit), total, guidesFirst };
    },
  };
}

export type MeiliEngine = ReturnType<typeof createMeiliEngine>;
