// Search: the query a client may send, what comes back, and the admin's synonym lists.
import { z } from 'zod';

export const SEARCH_ENGINES = ['postgres', 'meilisearch'] as const;
export type SearchEngineName = (typeof SEARCH_ENGINES)[number];

export const SEARCH_KINDS = ['guide', 'article'] as const;
export type SearchKind = (typeof SEARCH_KINDS)[number];

/** Longer text is a paste, not a search; refusing it keeps every query cheap. */
export const SEARCH_MAX_CHARS = 200;
export const SEARCH_MAX_LIMIT = 50;

// An empty filter from a cleared form field means no filter.
const tagFilter = (label: string) =>
  z.preprocess(
    (v) => (v === '' ? undefined : v),
    z
      .string({ error: `${label} must be one tag` })
      .regex(/^[a-z0-9-]{1,60}$/, `${label} must be a tag such as "electric" or "hot-melt"`)
      .optional(),
  );

export const SearchQuery = z.object({
  q: z.string({ error: 'Search text must be text' }).max(SEARCH_MAX_CHARS, `Search text must be at most ${SEARCH_MAX_CHARS} characters`).default(''),
  kind: z.enum(['all', ...SEARCH_KINDS], { error: 'Kind must be all, guide or article' }).default('all'),
  actuation: tagFilter('Actuation'),
  component: tagFilter('Component'),
  fluid: tagFilter('Fluid'),
  limit: z.coerce
    .number({ error: 'Limit must be a number' })
    .int('Limit must be a whole number')
    .min(1, 'Limit must be at least 1')
    .max(SEARCH_MAX_LIMIT, `Limit must be at most ${SEARCH_MAX_LIMIT}`)
    .default(20),
});
export type SearchQuery = z.output<typeof SearchQuery>;

export interface SearchHit {
  kind: SearchKind;
  id: number;
  title: string;
  /** The title with matched words in <mark>; no other markup, everything else escaped. */
  titleHtml: string;
  /** Guides only: the symptom the guide starts from. */
  symptom: string | null;
  /** A passage with matched words in <mark>; no other markup, everything else escaped. */
  snippetHtml: string;
  tags: string[];
  score: number;
  /** Meilisearch may find a guide through one of its steps. */
  step: { id: string; title: string } | null;
}

export interface SearchResponse {
  query: string;
  engine: SearchEngineName;
  /** True when Meilisearch is configured but PostgreSQL answered this request. */
  fallback: boolean;
  results: SearchHit[];
  total: number;
  /** Symptom-like queries list guides before articles. */
  guidesFirst: boolean;
  /** The query as typo tolerance read it, when it changed words. */
  corrected: string | null;
  /** What to try when little or nothing was found. */
  suggestions: string[];
  tookMs: number;
}

const term = z
  .string({ error: 'A synonym must be text' })
  .trim()
  .min(1, 'A synonym cannot be empty')
  .max(40, 'A synonym is at most 40 characters')
  .regex(/^[\p{L}\p{N}][\p{L}\p{N}' -]*$/u, 'A synonym uses letters, digits, spaces, hyphens and apostrophes');

export const SynonymGroup = z.object({
  terms: z.array(term, { error: 'Terms must be a list' }).min(2, 'A synonym group needs at least two words').max(12, 'A synonym group has at most 12 words'),
});

export const SynonymsInput = z.object({
  groups: z.array(SynonymGroup, { error: 'Groups must be a list' }).max(200, 'At most 200 synonym groups'),
});
export type SynonymsInput = z.output<typeof SynonymsInput>;

export const DEFAULT_SYNONYMS: string[][] = [
  ['drip', 'drool', 'dribble'],
  ['weep', 'seep', 'leak'],
  ['shot', 'dot', 'deposit'],
  ['gun', 'valve', 'applicator'],
];

export interface SearchAdminStatus {
  configured: SearchEngineName;
  /** What answers searches right now: Meilisearch, or PostgreSQL while Meilisearch is failing. */
  answering: SearchEngineName;
  meili: {
    url: string | null;
    healthy: boolean | null;
    failingSince: string | null;
    lastError: string | null;
    incidents: number;
    indexes: { uid: string; documents: number | null }[];
  } | null;
  postgres: { guides: number; articles: number; words: number; tableBytes: number };
  lastSyncAt: string | null;
  lastChangeAt: string | null;
  jobs: { target: SearchEngineName; pending: number; failed: number; lastError: string | null }[];
}
