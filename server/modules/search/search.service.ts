// One search service over two engines, chosen at start: Meilisearch when it is configured and
// answering in time, PostgreSQL otherwise. Also the admin's view: engine state, synonyms, rebuild.
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { SessionUser } from '../../../src/shared/schemas/auth';
import type { SearchAdminStatus, SearchEngineName, SearchQuery, SearchResponse } from '../../../src/shared/schemas/search';
import type { Config } from '../../config/env';
import { AppError } from '../../lib/app-error';
import { createTagsService } from '../tags/tags.service';
import { createMeiliEngine, isIndexMissing, MeiliHealth, type MeiliEngine } from './search.meili';
import { createPostgresEngine, type EngineResult } from './search.postgres';
import { searchRepository as repo } from './search.repository';
import { createSync, type SearchSync } from './search.sync';

export interface SearchServiceDeps {
  db: Knex;
  config: Config;
  logger: Logger;
}

const FACETS = ['actuation', 'component', 'fluid'] as const;

export function createSearchService(deps: SearchServiceDeps) {
  const { db, config, logger } = deps;
  const tags = createTagsService(db);
  const postgres = createPostgresEngine(db);
  const meili: MeiliEngine | null = config.MEILI_URL && config.MEILI_API_KEY ? createMeiliEngine({ url: config.MEILI_URL, apiKey: config.MEILI_API_KEY, timeoutMs: config.MEILI_TIMEOUT_MS }) : null;
  const health = meili
    ? new MeiliHealth(logger, async () => {
        await repo.replayNow(db, 'meilisearch');
      })
    : null;
  const sync: SearchSync = createSync({ db, logger, meili, health });
  const configured: SearchEngineName = meili ? 'meilisearch' : 'postgres';

  /** Filter values must be tags of the right group in the user's organisation: a typo is a 400, not an empty page. */
  async function checkFacets(organisationId: number, query: SearchQuery): Promise<string[]> {
    const wanted = FACETS.filter((f) => query[f]);
    if (!wanted.length) return [];
    const list = await tags.list(organisationId, { includeInactive: true });
    const fields: Record<string, string> = {};
    for (const f of wanted) {
      if (!list.some((t) => t.group === f && t.slug === query[f])) fields[f] = `Unknown ${f} tag '${query[f]}'`;
    }
    const first = Object.values(fields)[0];
    if (first) throw AppError.invalid(first, fields);
    return wanted.map((f) => query[f]!);
  }

  async function fromMeili(user: SessionUser, query: SearchQuery): Promise<EngineResult | null> {
    if (!meili || !health || !health.shouldTry()) return null;
    try {
      const r = await meili.search({
        organisationId: user.organisationId,
        q: query.q,
        kind: query.kind,
        facets: { actuation: query.actuation, component: query.component, fluid: query.fluid },
        limit: query.limit,
      });
      await health.success();
      const help = r.hits.length ? { corrected: null, suggestions: [] } : await postgres.suggest(user.organisationId, query.q);
      return { ...r, total: Math.max(r.total, r.hits.length), ...help };
    } catch (err) {
      if (isIndexMissing(err)) {
        // Nothing was ever indexed for this organisation: create its indexes in the background.
        await repo.enqueueSettings(db, user.organisationId);
        return null;
      }
      health.failure(err, 'search');
      return null;
    }
  }

  return {
    sync,
    configured,

    async search(user: SessionUser, query: SearchQuery): Promise<SearchResponse> {
      const started = performance.now();
      const q = query.q.trim();
      const facetTags = await checkFacets(user.organisationId, query);
      const base = { query: q, fallback: false, corrected: null, suggestions: [] as string[] };
      if (!q && !facetTags.length) {
        return { ...base, engine: configured, results: [], total: 0, guidesFirst: false, tookMs: 0 };
      }
      const viaMeili = q ? await fromMeili(user, { ...query, q }) : null;
      const result = viaMeili ?? (await postgres.search({ organisationId: user.organisationId, q, kind: query.kind, tags: facetTags, limit: query.limit }));
      return {
        ...base,
        engine: viaMeili ? 'meilisearch' : 'postgres',
        fallback: Boolean(meili) && !viaMeili && Boolean(q),
        results: result.hits,
        total: result.total,
        guidesFirst: result.guidesFirst,
        corrected: result.corrected,
        suggestions: result.suggestions,
        tookMs: Math.round((performance.now() - started) * 10) / 10,
      };
    },

    async status(user: SessionUser): Promise<SearchAdminStatus> {
      const [counts, jobs, state] = await Promise.all([repo.documentCounts(db), repo.jobCounts(db), repo.syncState(db)]);
      const targets: SearchEngineName[] = meili ? ['postgres', 'meilisearch'] : ['postgres'];
      return {
        configured,
        answering: meili && health && !health.failing ? 'meilisearch' : 'postgres',
        meili:
          meili && health
            ? {
                url: meili.url,
                healthy: !health.failing,
                failingSince: health.failingSince?.toISOString() ?? null,
                lastError: health.lastError,
                incidents: health.incidents,
                indexes: await meili.stats(user.organisationId),
              }
            : null,
        postgres: counts,
        lastSyncAt: state.last_run_at?.toISOString() ?? null,
        lastChangeAt: state.last_change_at?.toISOString() ?? null,
        jobs: targets.map((target) => ({
          target,
          pending: jobs.rows.find((r) => r.target === target && r.status === 'pending')?.n ?? 0,
          failed: jobs.rows.find((r) => r.target === target && r.status === 'failed')?.n ?? 0,
          lastError: jobs.errors.find((e) => e.target === target)?.last_error ?? null,
        })),
      };
    },

    async synonyms(organisationId: number): Promise<string[][]> {
      await postgres.ensureSynonyms(organisationId);
      return repo.listSynonyms(db, organisationId);
    },

    async replaceSynonyms(organisationId: number, groups: string[][]): Promise<string[][]> {
      const cleaned = groups.map((g) => [...new Set(g.map((t) => t.trim().toLowerCase()))]).filter((g) => g.length >= 2);
      await repo.replaceSynonyms(db, organisationId, cleaned);
      postgres.invalidateSynonyms(organisationId);
      if (meili) await repo.enqueueSettings(db, organisationId);
      return repo.listSynonyms(db, organisationId);
    },

    /** Queues every item of the organisation for every engine; the sync job does the work. */
    async reindex(organisationId: number): Promise<{ queued: number }> {
      const queued = await sync.enqueueAll(organisationId);
      if (meili) await repo.enqueueSettings(db, organisationId);
      return { queued };
    },
  };
}

export type SearchService = ReturnType<typeof createSearchService>;
