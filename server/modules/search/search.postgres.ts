// The PostgreSQL engine: websearch syntax with synonyms, ranking on the compact title/symptom
// vector, snippets for the returned rows only, and a typo-tolerant second pass through the
// vocabulary when the first finds little. Always available; the fallback for Meilisearch.
import type { Knex } from 'knex';
import type { SearchHit, SearchKind } from '../../../src/shared/schemas/search';
import { searchRepository as repo, type PgHitRow, type SearchFilters, type SynonymPairs } from './search.repository';
import { buildSynonymMap, checkableWords, markedHtml, synonymPairs } from './search.text';

/** Fewer results than this and the typo-tolerant pass runs. */
const FEW = 3;
/** Synonyms edited in another process reach this one within this time. */
const SYNONYM_TTL_MS = 30_000;

export interface EngineQuery {
  organisationId: number;
  q: string;
  kind: 'all' | SearchKind;
  tags: string[];
  limit: number;
}

export interface EngineResult {
  hits: SearchHit[];
  total: number;
  guidesFirst: boolean;
  corrected: string | null;
  suggestions: string[];
}

function toHit(r: PgHitRow): SearchHit {
  return {
    kind: r.kind,
    id: r.ref_id,
    title: r.title,
    titleHtml: markedHtml(r.title_hl),
    symptom: r.kind === 'guide' ? r.symptom : null,
    snippetHtml: markedHtml(/[.!?…:]$/.test(r.snippet.trim()) || !r.snippet.trim() ? r.snippet : `${r.snippet.trim()} …`),
    tags: r.tags,
    score: Math.round(r.score * 10000) / 10000,
    step: null,
  };
}

export function createPostgresEngine(db: Knex) {
  const synonymCache = new Map<number, { at: number; pairs: SynonymPairs }>();
  const seeded = new Set<number>();

  async function ensureSynonyms(organisationId: number) {
    if (seeded.has(organisationId)) return;
    await repo.ensureSynonyms(db, organisationId);
    seeded.add(organisationId);
  }

  async function synonyms(organisationId: number): Promise<SynonymPairs> {
    const hit = synonymCache.get(organisationId);
    if (hit && Date.now() - hit.at < SYNONYM_TTL_MS) return hit.pairs;
    await ensureSynonyms(organisationId);
    const pairs = synonymPairs(buildSynonymMap(await repo.synonymTerms(db, organisationId)));
    synonymCache.set(organisationId, { at: Date.now(), pairs });
    return pairs;
  }

  /** Spelling suggestions for the words of a query, from the vocabulary of what is published. */
  async function corrections(organisationId: number, words: string[]) {
    const checkable = checkableWords(words);
    const found = await repo.corrections(db, organisationId, checkable);
    const corrected = found.size ? words.map((w) => found.get(w)?.[0] ?? w).join(' ') : null;
    return { checkable, found, corrected };
  }

  async function suggestionsFor(organisationId: number, corrected: string | null): Promise<string[]> {
    const symptoms = await repo.guideSymptoms(db, organisationId, 5);
    return [...new Set([...(corrected ? [corrected] : []), ...symptoms])].slice(0, 6);
  }

  return {
    ensureSynonyms,

    invalidateSynonyms(organisationId: number) {
      synonymCache.delete(organisationId);
      seeded.add(organisationId);
    },

    async search(query: EngineQuery): Promise<EngineResult> {
      const filters: SearchFilters = { kind: query.kind, tags: query.tags };
      if (!query.q.trim()) {
        const rows = await repo.browse(db, query.organisationId, filters, query.limit);
        return { hits: rows.map(toHit), total: rows[0]?.total ?? 0, guidesFirst: false, corrected: null, suggestions: [] };
      }
      const pairs = await synonyms(query.organisationId);
      let rows: PgHitRow[] = await repo.search(db, query.organisationId, query.q, pairs, filters, query.limit);
      let corrected: string | null = null;

      if (rows.length < FEW) {
        const parsed = await repo.parse(db, query.q);
        const c = await corrections(query.organisationId, parsed.words);
        if (c.found.size || c.checkable.length > 1) {
          // Any word or any of its close spellings: a relaxed pass should find something rather than nothing.
          const text = c.checkable.flatMap((w) => [w, ...(c.found.get(w) ?? [])]).join(' or ');
          const more = text ? await repo.search(db, query.organisationId, text, pairs, filters, query.limit) : [];
          const seen = new Set(rows.map((r) => `${r.kind}:${r.ref_id}`));
          rows = [...rows, ...more.filter((r) => !seen.has(`${r.kind}:${r.ref_id}`))].slice(0, query.limit);
          if (c.found.size) corrected = c.corrected;
        }
      }

      const total = rows.length ? Math.max(rows.length, ...rows.map((r) => r.total)) : 0;
      const guidesFirst = rows.some((r) => r.guides_first);
      // The relaxed pass appends; for a symptom the technician still wants every guide before any article.
      if (guidesFirst) rows = [...rows.filter((r) => r.kind === 'guide'), ...rows.filter((r) => r.kind !== 'guide')];
      return {
        hits: rows.map(toHit),
        total,
        guidesFirst,
        corrected,
        suggestions: rows.length < FEW ? await suggestionsFor(query.organisationId, corrected) : [],
      };
    },

    /** "Nothing found" help for another engine's empty answer. */
    async suggest(organisationId: number, q: string): Promise<{ corrected: string | null; suggestions: string[] }> {
      const parsed = await repo.parse(db, q);
      const { corrected } = await corrections(organisationId, parsed.words);
      return { corrected, suggestions: await suggestionsFor(organisationId, corrected) };
    },
  };
}

export type PostgresEngine = ReturnType<typeof createPostgresEngine>;
