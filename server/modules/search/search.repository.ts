// The search module's own tables: documents and their vectors, the vocabulary for typo tolerance,
// synonyms, the sync queue and its watermark. Source tables are only ever read.
import type { Knex } from 'knex';
import { preparedQuery as prepared } from '../../db/prepared';
import { DEFAULT_SYNONYMS, type SearchEngineName, type SearchKind } from '../../../src/shared/schemas/search';
import { MARK_CLOSE, MARK_OPEN, type SearchSource } from './search.documents';

/** Snippets quote at most this much text; the vectors still cover all of it. */
const SNIPPET_SOURCE_CHARS = 20_000;
/**
 * Candidate caps: every title/symptom match up to HEAD_CAP is ranked, plus up to BODY_CAP matches
 * found only in the body. Ranking all of a common word's matches is what makes the textbook query slow.
 */
const HEAD_CAP = 200;
const BODY_CAP = 100;
/** Snippets are cut from a window of the body around the first matched word: headlining a whole body is the costly part. */
const SNIPPET_BEFORE = 160;
const SNIPPET_WINDOW = 480;

const HEADLINE = `StartSel=${MARK_OPEN}, StopSel=${MARK_CLOSE}, MaxWords=24, MinWords=10, ShortWord=2, MaxFragments=2, FragmentDelimiter=" … "`;
const TITLE_HEADLINE = `StartSel=${MARK_OPEN}, StopSel=${MARK_CLOSE}, HighlightAll=true`;

export interface SearchFilters {
  kind: 'all' | SearchKind;
  tags: string[];
}

/** Synonyms as the search query takes them: quoted lexemes and the tsquery text replacing each. */
export interface SynonymPairs {
  tokens: string[];
  substitutes: string[];
}

export interface PgHitRow {
  kind: SearchKind;
  ref_id: number;
  title: string;
  symptom: string;
  tags: string[];
  score: number;
  title_hl: string;
  snippet: string;
  guides_first: boolean;
  total: number;
}

function filterSql(f: SearchFilters, bindings: Knex.Value[]): string {
  let sql = '';
  if (f.kind !== 'all') {
    sql += ' and d.kind = ?';
    bindings.push(f.kind);
  }
  if (f.tags.length) {
    sql += ' and d.tags @> ?::text[]';
    bindings.push(f.tags);
  }
  return sql;
}

export const searchRepository = {
  // ---- documents --------------------------------------------------------------------------

  async upsertDocuments(db: Knex, sources: SearchSource[]) {
    if (!sources.length) return;
    const rows = sources.map((s) => ({
      organisation_id: s.organisationId,
      kind: s.kind,
      ref_id: s.refId,
      version: s.version,
      title: s.title,
      symptom: s.symptom,
      summary: s.summary,
      tags: s.tags,
      body: s.body.slice(0, SNIPPET_SOURCE_CHARS),
      full_body: s.body,
      head_b: [s.symptom, ...s.headWords].join(' . '),
      fuzzy: [s.title, s.symptom, ...s.headWords].join(' . '),
      stamp: s.stamp.toISOString(),
      published_at: s.publishedAt?.toISOString() ?? null,
    }));
    await db.raw(
      `insert into search_documents as sd
         (organisation_id, kind, ref_id, version, title, symptom, summary, tags, body, tsv, tsv_head, tsv_symptom, fuzzy, source_stamp, published_at, indexed_at)
       select x.organisation_id, x.kind, x.ref_id, x.version, x.title, x.symptom, x.summary, x.tags, x.body,
              setweight(to_tsvector('beadpath_english', x.title), 'A')
                || setweight(to_tsvector('beadpath_english', x.head_b), 'B')
                || setweight(to_tsvector('beadpath_english', x.summary || ' ' || x.full_body), 'C'),
              setweight(to_tsvector('beadpath_english', x.title), 'A') || setweight(to_tsvector('beadpath_english', x.head_b), 'B'),
              to_tsvector('beadpath_english', x.symptom),
              x.fuzzy, x.stamp, x.published_at, now()
         from jsonb_to_recordset(?::jsonb) as x(organisation_id int, kind text, ref_id int, version int, title text, symptom text,
              summary text, tags text[], body text, full_body text, head_b text, fuzzy text, stamp timestamptz, published_at timestamptz)
       on conflict (kind, ref_id) do update set
         organisation_id = excluded.organisation_id, version = excluded.version, title = excluded.title, symptom = excluded.symptom,
         summary = excluded.summary, tags = excluded.tags, body = excluded.body, tsv = excluded.tsv, tsv_head = excluded.tsv_head,
         tsv_symptom = excluded.tsv_symptom, fuzzy = excluded.fuzzy, source_stamp = excluded.source_stamp,
         published_at = excluded.published_at, indexed_at = now()`,
      [JSON.stringify(rows)],
    );
  },

  async deleteDocuments(db: Knex, kind: SearchKind, refIds: number[]) {
    if (!refIds.length) return;
    await db('search_documents').where({ kind }).whereIn('ref_id', refIds).delete();
  },

  async documentCounts(db: Knex) {
    const rows = await db('search_documents').select('kind').count('* as n').groupBy('kind');
    const size = await db.raw(`select pg_total_relation_size('search_documents') as bytes`);
    const words = await db('search_words').count('* as n').first();
    const by = (k: string) => Number(rows.find((r) => r.kind === k)?.n ?? 0);
    return { guides: by('guide'), articles: by('article'), words: Number(words?.n ?? 0), tableBytes: Number(size.rows[0].bytes) };
  },

  // ---- vocabulary for typo tolerance ----------------------------------------------------------

  /** The words of titles, symptoms, tags and causes of what is published, with how many documents use each. */
  async rebuildWords(db: Knex, organisationId: number) {
    await db.transaction(async (trx) => {
      await trx('search_words').where({ organisation_id: organisationId }).delete();
      await trx.raw(
        `insert into search_words (organisation_id, word, ndocs)
         select ?, w, count(*) from search_documents d, unnest(tsvector_to_array(to_tsvector('beadpath_simple', d.fuzzy))) as w
          where d.organisation_id = ? and length(w) between 3 and 40 and w ~ '^[[:alpha:]]'
          group by w`,
        [organisationId, organisationId],
      );
      await trx.raw(
        `insert into search_org_state (organisation_id, words_built_at) values (?, now())
         on conflict (organisation_id) do update set words_built_at = now()`,
        [organisationId],
      );
    });
  },

  /** For each word not in the vocabulary: the closest vocabulary words by trigram similarity. */
  async corrections(db: Knex, organisationId: number, words: string[]): Promise<Map<string, string[]>> {
    const out = new Map<string, string[]>();
    if (!words.length) return out;
    const res = await db.raw(
      `select w.w, c.word, c.sim, ts_lexize('english_stem', c.word) = ts_lexize('english_stem', w.w) as same_stem
         from unnest(?::text[]) as w(w)
         cross join lateral (
           select sw.word, similarity(sw.word, w.w) as sim
             from search_words sw
            where sw.organisation_id = ? and sw.word % w.w and sw.word <> w.w
            order by sim desc, sw.ndocs desc, sw.word
            limit 4) c
        where c.sim >= 0.34
          and not exists (select 1 from search_words e where e.organisation_id = ? and e.word = w.w)
        order by w.w, c.sim desc, c.word`,
      [words, organisationId, organisationId],
    );
    // "drip" is not misspelt because only "drips" is in the vocabulary: a word sharing its stem with
    // a vocabulary word is known, and gets no corrections at all.
    const known = new Set((res.rows as { w: string; same_stem: boolean }[]).filter((r) => r.same_stem).map((r) => r.w));
    for (const r of res.rows as { w: string; word: string }[]) {
      if (known.has(r.w)) continue;
      const list = out.get(r.w) ?? [];
      if (list.length < 3) list.push(r.word);
      out.set(r.w, list);
    }
    return out;
  },

  // ---- the PostgreSQL engine's queries --------------------------------------------------------

  /** The plain words of a query, for spelling suggestions. */
  async parse(db: Knex, q: string): Promise<{ words: string[] }> {
    // Words keep the order they were typed in (for "did you mean"); stop words are left out.
    const res = await db.raw(
      `select array(select w from regexp_split_to_table(lower(unaccent(?)), '[^[:alpha:]'']+') with ordinality as t(w, n)
                     where length(w) >= 2 and length(to_tsvector('beadpath_english', w)) > 0 order by n) as words`,
      [q],
    );
    return { words: res.rows[0].words };
  },

  /**
   * One round trip: parse the websearch text, swap in synonym groups (lexeme by lexeme, so phrases
   * and negation keep their shape), rank the capped candidates on the compact vector, and headline
   * only the returned rows, each on a window of its body around the first matched word.
   */
  async search(db: Knex, organisationId: number, text: string, synonyms: SynonymPairs, filters: SearchFilters, limit: number): Promise<PgHitRow[]> {
    const b1: Knex.Value[] = [];
    const f1 = filterSql(filters, b1);
    const b2: Knex.Value[] = [];
    const f2 = filterSql(filters, b2);
    const res = await prepared(
      db,
      `with raw as (select websearch_to_tsquery('beadpath_english', ?)::text as t),
       -- (Knex reads every question mark as a parameter, so these patterns use capturing groups only.)
       parts as (
         select r.n, r.m[1] as tok from raw, regexp_matches(raw.t, '(''([^'']|'''')*''|[^'']+)', 'g') with ordinality as r(m, n)
       ),
       syn as (select * from unnest(?::text[], ?::text[]) as s(tok, sub)),
       q as (
         select coalesce(string_agg(coalesce(syn.sub, parts.tok), '' order by parts.n), '')::tsquery as q
           from parts left join syn on syn.tok = parts.tok
       ),
       lex as (
         select array(select distinct m[1] from q, regexp_matches(q.q::text, '''(([^'']|''''){3,})''', 'g') as m) as words
       ),
       cand as (
         select distinct on (u.id) u.*
           from ((select d.id, d.kind, ts_rank_cd('{0.1, 0.2, 0.5, 1.0}', d.tsv_head, q.q, 1) as head_rank,
                         (d.kind = 'guide' and d.tsv_symptom @@ q.q) as symptom_hit
                    from search_documents d, q
                   where d.organisation_id = ? and d.tsv_head @@ q.q ${f1}
                   limit ${HEAD_CAP})
                 union all
                 (select d.id, d.kind, 0::real, false
                    from search_documents d, q
                   where d.organisation_id = ? and d.tsv @@ q.q ${f2}
                   limit ${BODY_CAP})) u
          order by u.id, u.head_rank desc
       ),
       top as (
         select c.id, c.guides_first, c.total,
                (c.head_rank + 0.01) * (case when c.guides_first and c.kind = 'guide' then 2 else 1 end) as score
           from (select cand.*, bool_or(cand.symptom_hit) over () as guides_first, count(*) over () as total from cand) c
          order by score desc, c.id desc
          limit ?
       )
       select d.kind, d.ref_id, d.title, d.symptom, d.tags, top.score::float8 as score, top.guides_first, top.total::int as total,
              ts_headline('beadpath_english', d.title, q.q, ?) as title_hl,
              ts_headline('beadpath_english',
                concat_ws(' — ', nullif(d.symptom, ''), nullif(d.summary, ''),
                  nullif(substr(d.body, greatest(1, coalesce(pos.p, 1) - ${SNIPPET_BEFORE}), ${SNIPPET_WINDOW}), '')),
                q.q, ?) as snippet
         from top join search_documents d on d.id = top.id cross join q cross join lex
         left join lateral (select min(nullif(strpos(lower(d.body), w), 0)) as p from unnest(lex.words) as w) pos on true
        order by top.score desc, top.id desc`,
      [text, synonyms.tokens, synonyms.substitutes, organisationId, ...b1, organisationId, ...b2, limit, TITLE_HEADLINE, HEADLINE],
    );
    return res.rows;
  },

  /** No words but filters: the newest published items that carry the tags. */
  async browse(db: Knex, organisationId: number, filters: SearchFilters, limit: number): Promise<PgHitRow[]> {
    const b: Knex.Value[] = [];
    const f = filterSql(filters, b);
    const res = await db.raw(
      `select d.kind, d.ref_id, d.title, d.symptom, d.tags, 0::float8 as score, false as guides_first, count(*) over ()::int as total,
              d.title as title_hl, left(concat_ws(' — ', nullif(d.symptom, ''), nullif(d.summary, ''), nullif(d.body, '')), 200) as snippet
         from search_documents d
        where d.organisation_id = ? ${f}
        order by (d.kind = 'guide') desc, d.published_at desc nulls last, d.id desc
        limit ?`,
      [organisationId, ...b, limit],
    );
    return res.rows;
  },

  async guideSymptoms(db: Knex, organisationId: number, limit: number): Promise<string[]> {
    const rows = await db('search_documents').where({ organisation_id: organisationId, kind: 'guide' }).whereNot('symptom', '').orderBy('published_at', 'desc').limit(limit).select('symptom');
    return [...new Set(rows.map((r) => r.symptom as string))];
  },

  // ---- synonyms -------------------------------------------------------------------------------

  /** Gives an organisation the default trade synonyms once, the first time search meets it. */
  async ensureSynonyms(db: Knex, organisationId: number) {
    await db.transaction(async (trx) => {
      const claimed = await trx.raw(
        `insert into search_org_state (organisation_id, synonyms_seeded) values (?, true)
         on conflict (organisation_id) do update set synonyms_seeded = true where search_org_state.synonyms_seeded = false
         returning organisation_id`,
        [organisationId],
      );
      if (!claimed.rows.length) return;
      await trx('search_synonyms').insert(DEFAULT_SYNONYMS.map((terms, i) => ({ organisation_id: organisationId, terms, position: i })));
    });
  },

  async listSynonyms(db: Knex, organisationId: number): Promise<string[][]> {
    const rows = await db('search_synonyms').where({ organisation_id: organisationId }).orderBy(['position', 'id']).select('terms');
    return rows.map((r) => r.terms as string[]);
  },

  async replaceSynonyms(db: Knex, organisationId: number, groups: string[][]) {
    await db.transaction(async (trx) => {
      await trx.raw(
        `insert into search_org_state (organisation_id, synonyms_seeded) values (?, true)
         on conflict (organisation_id) do update set synonyms_seeded = true`,
        [organisationId],
      );
      await trx('search_synonyms').where({ organisation_id: organisationId }).delete();
      if (groups.length) await trx('search_synonyms').insert(groups.map((terms, i) => ({ organisation_id: organisationId, terms, position: i })));
    });
  },

  /** Every synonym term as PostgreSQL reads it (stemmed, accents off), with its group. */
  async synonymTerms(db: Knex, organisationId: number): Promise<{ group: number; query: string }[]> {
    const res = await db.raw(
      `select s.id as "group", phraseto_tsquery('beadpath_english', t.term)::text as query
         from search_synonyms s cross join lateral unnest(s.terms) with ordinality as t(term, ord)
        where s.organisation_id = ?
        order by s.position, s.id, t.ord`,
      [organisationId],
    );
    return res.rows;
  },

  // ---- the sync queue ---------------------------------------------------------------------------

  async syncState(db: Knex) {
    const row = await db('search_sync_state').where({ id: 1 }).first();
    return row as { watermark: Date; last_run_at: Date | null; last_change_at: Date | null; last_error: string | null };
  },

  async now(db: Knex): Promise<Date> {
    return (await db.raw('select now() as t')).rows[0].t;
  },

  async finishScan(db: Knex, scanStart: Date, changed: boolean, error: string | null) {
    await db('search_sync_state')
      .where({ id: 1 })
      .update({ watermark: scanStart, last_run_at: db.fn.now(), last_error: error, ...(changed ? { last_change_at: db.fn.now() } : {}) });
  },

  /**
   * Queues every guide and article changed since the watermark, for each engine. The scan looks a
   * minute further back than the watermark, so a transaction that committed late is not missed;
   * an unchanged stamp makes the upsert a no-op.
   */
  async enqueueChanges(db: Knex, targets: SearchEngineName[], since: Date): Promise<number> {
    const conflict = `on conflict (target, kind, ref_id) do update set stamp = excluded.stamp, organisation_id = excluded.organisation_id,
         status = 'pending', attempts = 0, next_attempt_at = now(), last_error = null, updated_at = now()
       where search_jobs.stamp < excluded.stamp`;
    const a = await db.raw(
      `insert into search_jobs (target, kind, ref_id, organisation_id, stamp)
       select t.target, 'article', a.id, a.organisation_id, greatest(a.updated_at, r.updated_at)
         from articles a left join article_revisions r on r.id = a.published_revision_id
        cross join unnest(?::text[]) as t(target)
        where a.id in (select id from articles where updated_at > ?::timestamptz - interval '60 seconds'
                       union select article_id from article_revisions where updated_at > ?::timestamptz - interval '60 seconds')
       ${conflict}`,
      [targets, since, since],
    );
    const g = await db.raw(
      `insert into search_jobs (target, kind, ref_id, organisation_id, stamp)
       select t.target, 'guide', g.id, g.organisation_id, greatest(g.updated_at, v.updated_at)
         from guides g left join guide_versions v on v.id = g.published_version_id
        cross join unnest(?::text[]) as t(target)
        where g.id in (select id from guides where updated_at > ?::timestamptz - interval '60 seconds'
                       union select guide_id from guide_versions where updated_at > ?::timestamptz - interval '60 seconds')
       ${conflict}`,
      [targets, since, since],
    );
    return (a.rowCount ?? 0) + (g.rowCount ?? 0);
  },

  /** Documents whose source row is gone (deleted, or its organisation removed) are queued for removal. */
  async enqueueDeletions(db: Knex, targets: SearchEngineName[]): Promise<number> {
    const res = await db.raw(
      `insert into search_jobs (target, kind, ref_id, organisation_id, stamp)
       select t.target, d.kind, d.ref_id, d.organisation_id, now()
         from search_documents d cross join unnest(?::text[]) as t(target)
        where (d.kind = 'article' and not exists (select 1 from articles a where a.id = d.ref_id))
           or (d.kind = 'guide' and not exists (select 1 from guides g where g.id = d.ref_id))
       on conflict (target, kind, ref_id) do update set stamp = excluded.stamp, status = 'pending', attempts = 0,
            next_attempt_at = now(), last_error = null, updated_at = now()
        where search_jobs.status <> 'pending'`,
      [targets],
    );
    return res.rowCount ?? 0;
  },

  /** Everything, again: after a configuration change or when an admin asks for a rebuild. */
  async enqueueAll(db: Knex, targets: SearchEngineName[], organisationId?: number): Promise<number> {
    const org = organisationId ? 'and x.organisation_id = ?' : '';
    const bindings = organisationId ? [targets, organisationId] : [targets];
    const res = await db.raw(
      `insert into search_jobs (target, kind, ref_id, organisation_id, stamp)
       select t.target, x.kind, x.id, x.organisation_id, now()
         from (select 'article' as kind, id, organisation_id from articles
               union select 'guide', id, organisation_id from guides
               union select kind, ref_id, organisation_id from search_documents) x
        cross join unnest(?::text[]) as t(target)
        where true ${org}
       on conflict (target, kind, ref_id) do update set stamp = excluded.stamp, status = 'pending', attempts = 0,
            next_attempt_at = now(), last_error = null, updated_at = now()`,
      bindings,
    );
    return res.rowCount ?? 0;
  },

  async enqueueSettings(db: Knex, organisationId: number) {
    await db.raw(
      `insert into search_jobs (target, kind, ref_id, organisation_id, stamp) values ('meilisearch', 'settings', ?, ?, now())
       on conflict (target, kind, ref_id) do update set stamp = excluded.stamp, status = 'pending', attempts = 0, next_attempt_at = now(), last_error = null, updated_at = now()`,
      [organisationId, organisationId],
    );
  },

  async hasJobs(db: Knex, target: SearchEngineName): Promise<boolean> {
    return Boolean(await db('search_jobs').where({ target }).first('id'));
  },

  /**
   * Takes due jobs. Claiming already pushes next_attempt_at out (a lease that doubles as the retry
   * back-off), so a crashed worker's jobs come back by themselves and two workers never share one.
   */
  async claim(db: Knex, target: SearchEngineName, limit: number): Promise<ClaimedJob[]> {
    const res = await db.raw(
      `update search_jobs set attempts = attempts + 1,
              next_attempt_at = now() + least(interval '1 second' * power(2, attempts + 1), interval '5 minutes'), updated_at = now()
        where id in (select id from search_jobs where target = ? and status = 'pending' and next_attempt_at <= now()
                      order by next_attempt_at, id limit ? for update skip locked)
        returning id, kind, ref_id, organisation_id, stamp::text as stamp, attempts`,
      [target, limit],
    );
    return res.rows.map((r: Record<string, unknown>) => ({ id: Number(r.id), kind: r.kind, refId: r.ref_id, organisationId: r.organisation_id, stamp: r.stamp, attempts: r.attempts }));
  },

  /** Done, unless the source changed again while it was being applied: then it stays due at once. */
  async complete(db: Knex, jobs: ClaimedJob[]) {
    if (!jobs.length) return;
    await db.raw(
      `update search_jobs j set
          status = case when j.stamp = x.stamp then 'done' else 'pending' end,
          synced_stamp = x.stamp, attempts = case when j.stamp = x.stamp then 0 else j.attempts end,
          next_attempt_at = case when j.stamp = x.stamp then j.next_attempt_at else now() end,
          last_error = null, updated_at = now()
         from jsonb_to_recordset(?::jsonb) as x(id bigint, stamp timestamptz)
        where j.id = x.id`,
      [JSON.stringify(jobs.map((j) => ({ id: j.id, stamp: j.stamp })))],
    );
  },

  async fail(db: Knex, jobs: ClaimedJob[], error: string, maxAttempts: number) {
    if (!jobs.length) return;
    await db('search_jobs')
      .whereIn(
        'id',
        jobs.map((j) => j.id),
      )
      .update({ last_error: error.slice(0, 500), status: db.raw(`case when attempts >= ? then 'failed' else 'pending' end`, [maxAttempts]), updated_at: db.fn.now() });
  },

  /** Meilisearch is back: everything it missed is due now, including jobs that had given up. */
  async replayNow(db: Knex, target: SearchEngineName) {
    await db('search_jobs').where({ target }).whereIn('status', ['pending', 'failed']).update({ status: 'pending', attempts: 0, next_attempt_at: db.fn.now(), updated_at: db.fn.now() });
  },

  async jobCounts(db: Knex) {
    const rows = await db('search_jobs').select('target', 'status').count('* as n').groupBy('target', 'status');
    const errors = (await db.raw(`select distinct on (target) target, last_error from search_jobs where last_error is not null order by target, updated_at desc`)).rows as {
      target: SearchEngineName;
      last_error: string;
    }[];
    return { rows: rows.map((r) => ({ target: r.target as SearchEngineName, status: r.status as string, n: Number(r.n) })), errors };
  },
};

export interface ClaimedJob {
  id: number;
  kind: SearchKind | 'settings';
  refId: number;
  organisationId: number;
  stamp: string;
  attempts: number;
}
