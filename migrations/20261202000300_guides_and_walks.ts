// Guides with immutable published versions and one mutable draft, the organisation's causes,
// walks with their append-only answer log, notes, and technicians' flags on steps.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('causes', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('code').notNullable();
    t.text('label').notNullable();
    t.text('component');
    t.boolean('active').notNullable().defaultTo(true);
    t.integer('position').notNullable().defaultTo(0);
    t.unique(['organisation_id', 'code']);
  });

  await knex.schema.createTable('guides', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    // active | retired (retired guides start no new walks; history is kept)
    t.text('status').notNullable().defaultTo('active');
    t.integer('draft_version_id');
    t.integer('published_version_id');
    // Bumped by every change to the draft: the optimistic lock behind 409 on a stale save.
    t.integer('lock_version').notNullable().defaultTo(1);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('retired_at', { useTz: true });
    t.timestamps(true, true);
  });
  await knex.raw(`alter table guides add constraint guides_status_valid check (status in ('active','retired'))`);

  await knex.schema.createTable('guide_versions', (t) => {
    t.increments('id');
    t.integer('guide_id').notNullable().references('guides.id').onDelete('CASCADE');
    t.integer('number').notNullable();
    // draft | in_review | published | superseded; a version that was ever published never changes.
    t.text('state').notNullable().defaultTo('draft');
    t.text('title').notNullable();
    t.text('symptom').notNullable();
    t.text('summary').notNullable().defaultTo('');
    t.specificType('tags', 'text[]').notNullable().defaultTo('{}');
    t.jsonb('content').notNullable();
    t.integer('error_count').notNullable().defaultTo(0);
    t.integer('warning_count').notNullable().defaultTo(0);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.integer('submitted_by').references('users.id').onDelete('SET NULL');
    t.timestamp('submitted_at', { useTz: true });
    t.integer('reviewed_by').references('users.id').onDelete('SET NULL');
    t.timestamp('published_at', { useTz: true });
    t.text('review_comment');
    t.timestamps(true, true);
    t.unique(['guide_id', 'number']);
  });
  await knex.raw(`alter table guide_versions add constraint guide_versions_state_valid check (state in ('draft','in_review','published','superseded'))`);
  await knex.schema.alterTable('guides', (t) => {
    t.foreign('draft_version_id').references('guide_versions.id').deferrable('deferred');
    t.foreign('published_version_id').references('guide_versions.id').deferrable('deferred');
  });

  await knex.schema.createTable('guide_events', (t) => {
    t.increments('id');
    t.integer('guide_id').notNullable().references('guides.id').onDelete('CASCADE');
    t.integer('version_number');
    t.text('kind').notNullable(); // created | submitted | withdrawn | approved | changes_requested | retired | restored | imported
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.text('comment');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('walks', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.integer('guide_id').notNullable().references('guides.id');
    t.integer('guide_version_id').notNullable().references('guide_versions.id');
    t.integer('user_id').notNullable().references('users.id');
    t.text('site');
    t.text('line');
    t.text('applicator');
    // open | ended | abandoned
    t.text('status').notNullable().defaultTo('open');
    t.text('current_step_id');
    t.text('ended_at_step_id');
    t.text('end_kind'); // finding | handoff | fixed-by-try | abandoned
    t.text('outcome'); // fixed | not-fixed | fixed-by-other
    t.text('cause_code');
    t.text('outcome_note');
    t.integer('answer_count').notNullable().defaultTo(0);
    t.timestamp('started_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('ended_at', { useTz: true });
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`alter table walks add constraint walks_status_valid check (status in ('open','ended','abandoned'))`);
  await knex.raw("create index walks_user_open on walks (user_id) where status = 'open'");
  await knex.raw('create index walks_guide on walks (guide_id, ended_at)');

  await knex.schema.createTable('walk_answers', (t) => {
    t.bigIncrements('id');
    t.integer('walk_id').notNullable().references('walks.id').onDelete('CASCADE');
    t.integer('seq').notNullable();
    // The client's idempotency key: a replayed answer is stored once.
    t.text('client_id').notNullable();
    t.text('kind').notNullable();
    t.text('step_id').notNullable();
    t.jsonb('payload').notNullable();
    t.timestamp('answered_at', { useTz: true }).notNullable();
    t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['walk_id', 'client_id']);
    t.unique(['walk_id', 'seq']);
  });

  await knex.schema.createTable('walk_notes', (t) => {
    t.increments('id');
    t.integer('walk_id').notNullable().references('walks.id').onDelete('CASCADE');
    t.text('client_id').notNullable();
    t.text('step_id').notNullable();
    t.text('text').notNullable().defaultTo('');
    t.specificType('file_ids', 'uuid[]').notNullable().defaultTo('{}');
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['walk_id', 'client_id']);
  });

  await knex.schema.createTable('step_flags', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.integer('guide_id').notNullable().references('guides.id').onDelete('CASCADE');
    t.integer('guide_version_id').notNullable().references('guide_versions.id');
    t.text('step_id').notNullable();
    t.integer('walk_id').references('walks.id').onDelete('SET NULL');
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.text('comment').notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('resolved_at', { useTz: true });
    t.integer('resolved_by').references('users.id').onDelete('SET NULL');
  });
  await knex.raw('create index step_flags_guide on step_flags (guide_id, resolved_at)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('step_flags');
  await knex.schema.dropTable('walk_notes');
  await knex.schema.dropTable('walk_answers');
  await knex.schema.dropTable('walks');
  await knex.schema.dropTable('guide_events');
  await knex.schema.alterTable('guides', (t) => {
    t.dropForeign(['draft_version_id']);
    t.dropForeign(['published_version_id']);
  });
  await knex.schema.dropTable('guide_versions');
  await knex.schema.dropTable('guides');
  await knex.schema.dropTable('causes');
}
