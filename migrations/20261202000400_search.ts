// Search: the module's own copy of published guides and articles with weighted text vectors, the
// words of titles and symptoms for typo tolerance, trade synonyms, and the sync queue with its watermark.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  // Both are trusted extensions (a database owner may create them without superuser rights).
  await knex.raw('create extension if not exists unaccent');
  await knex.raw('create extension if not exists pg_trgm');
  // English stemming that ignores accents, so "vàlve" and "valve" meet in one lexeme.
  await knex.raw('create text search configuration beadpath_english (copy = english)');
  await knex.raw('alter text search configuration beadpath_english alter mapping for hword, hword_part, word with unaccent, english_stem');
  await knex.raw('create text search configuration beadpath_simple (copy = simple)');
  await knex.raw('alter text search configuration beadpath_simple alter mapping for hword, hword_part, word, asciiword, asciihword, hword_asciipart with unaccent, simple');

  // Only published, visible content is ever stored here: a draft cannot leak from a table that never holds it.
  await knex.schema.createTable('search_documents', (t) => {
    t.bigIncrements('id');
    t.integer('organisation_id').notNullable();
    t.text('kind').notNullable();
    t.integer('ref_id').notNullable();
    t.integer('version').notNullable();
    t.text('title').notNullable();
    t.text('symptom').notNullable().defaultTo('');
    t.text('summary').notNullable().defaultTo('');
    t.specificType('tags', 'text[]').notNullable().defaultTo('{}');
    t.text('body').notNullable().defaultTo('');
    t.specificType('tsv', 'tsvector').notNullable();
    t.specificType('tsv_head', 'tsvector').notNullable();
    t.specificType('tsv_symptom', 'tsvector').notNullable();
    t.text('fuzzy').notNullable().defaultTo('');
    t.timestamp('source_stamp', { useTz: true }).notNullable();
    t.timestamp('published_at', { useTz: true });
    t.timestamp('indexed_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['kind', 'ref_id']);
  });
  await knex.raw(`alter table search_documents add constraint search_documents_kind_valid check (kind in ('guide','article'))`);
  await knex.raw('create index search_documents_tsv on search_documents using gin (tsv)');
  await knex.raw('create index search_documents_tsv_head on search_documents using gin (tsv_head)');
  await knex.raw('create index search_documents_org on search_documents (organisation_id, kind)');

  await knex.schema.createTable('search_words', (t) => {
    t.integer('organisation_id').notNullable();
    t.text('word').notNullable();
    t.integer('ndocs').notNullable();
    t.primary(['organisation_id', 'word']);
  });
  await knex.raw('create index search_words_trgm on search_words using gin (word gin_trgm_ops)');

  await knex.schema.createTable('search_synonyms', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.specificType('terms', 'text[]').notNullable();
    t.integer('position').notNullable().defaultTo(0);
    t.timestamps(true, true);
  });
  await knex.raw('create index search_synonyms_org on search_synonyms (organisation_id, position)');

  await knex.schema.createTable('search_org_state', (t) => {
    t.integer('organisation_id').primary().references('organisations.id').onDelete('CASCADE');
    // Default synonyms are given once; an admin who deletes them all keeps an empty list.
    t.boolean('synonyms_seeded').notNullable().defaultTo(false);
    t.timestamp('words_built_at', { useTz: true });
  });

  // One row per (engine, item): the newest change seen (stamp) and the one last applied (synced_stamp).
  await knex.schema.createTable('search_jobs', (t) => {
    t.bigIncrements('id');
    t.text('target').notNullable();
    t.text('kind').notNullable();
    t.integer('ref_id').notNullable();
    t.integer('organisation_id').notNullable();
    t.timestamp('stamp', { useTz: true }).notNullable();
    t.timestamp('synced_stamp', { useTz: true });
    t.text('status').notNullable().defaultTo('pending');
    t.integer('attempts').notNullable().defaultTo(0);
    t.timestamp('next_attempt_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text('last_error');
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['target', 'kind', 'ref_id']);
  });
  await knex.raw(`alter table search_jobs add constraint search_jobs_target_valid check (target in ('postgres','meilisearch'))`);
  await knex.raw(`alter table search_jobs add constraint search_jobs_kind_valid check (kind in ('guide','article','settings'))`);
  await knex.raw(`alter table search_jobs add constraint search_jobs_status_valid check (status in ('pending','done','failed'))`);
  await knex.raw(`create index search_jobs_due on search_jobs (target, next_attempt_at) where status = 'pending'`);

  await knex.schema.createTable('search_sync_state', (t) => {
    t.integer('id').primary();
    t.timestamp('watermark', { useTz: true }).notNullable().defaultTo(knex.raw(`'-infinity'::timestamptz`));
    t.timestamp('last_run_at', { useTz: true });
    t.timestamp('last_change_at', { useTz: true });
    t.text('last_error');
  });
  await knex.raw('alter table search_sync_state add constraint search_sync_state_single check (id = 1)');
  await knex('search_sync_state').insert({ id: 1 });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('search_sync_state');
  await knex.schema.dropTable('search_jobs');
  await knex.schema.dropTable('search_org_state');
  await knex.schema.dropTable('search_synonyms');
  await knex.schema.dropTable('search_words');
  await knex.schema.dropTable('search_documents');
  await knex.raw('drop text search configuration if exists beadpath_simple');
  await knex.raw('drop text search configuration if exists beadpath_english');
}
