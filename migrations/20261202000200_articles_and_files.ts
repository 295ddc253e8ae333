// Uploaded files, the organisation's tag lists, and articles with their revisions and review events.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('files', (t) => {
    t.uuid('id').primary();
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('kind').notNullable(); // photo | document
    t.text('mime').notNullable();
    t.text('original_name').notNullable();
    t.integer('size').notNullable();
    t.integer('width');
    t.integer('height');
    t.jsonb('variants').notNullable().defaultTo('{}');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`alter table files add constraint files_kind_valid check (kind in ('photo','document'))`);

  await knex.schema.createTable('tags', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('group').notNullable();
    t.text('slug').notNullable();
    t.text('label').notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.integer('position').notNullable().defaultTo(0);
    t.unique(['organisation_id', 'group', 'slug']);
  });
  await knex.raw(`alter table tags add constraint tags_group_valid check ("group" in ('actuation','component','fluid'))`);

  await knex.schema.createTable('articles', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('slug').notNullable();
    // State of the working copy: draft | in_review | published | archived.
    t.text('workflow').notNullable().defaultTo('draft');
    // Bumped by every save: the optimistic lock that turns a stale save into a 409.
    t.integer('version').notNullable().defaultTo(1);
    t.integer('head_revision_id');
    t.integer('published_revision_id');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.integer('submitted_by').references('users.id').onDelete('SET NULL');
    t.timestamp('submitted_at', { useTz: true });
    t.integer('reviewed_by').references('users.id').onDelete('SET NULL');
    t.timestamp('reviewed_at', { useTz: true });
    t.timestamps(true, true);
    t.unique(['organisation_id', 'slug']);
  });
  await knex.raw(`alter table articles add constraint articles_workflow_valid check (workflow in ('draft','in_review','published','archived'))`);

  await knex.schema.createTable('article_revisions', (t) => {
    t.increments('id');
    t.integer('article_id').notNullable().references('articles.id').onDelete('CASCADE');
    t.integer('number').notNullable();
    t.text('title').notNullable();
    t.text('summary').notNullable().defaultTo('');
    t.jsonb('body_json').notNullable();
    t.text('body_html').notNullable();
    t.text('body_text').notNullable();
    t.specificType('tags', 'text[]').notNullable().defaultTo('{}');
    t.specificType('keywords', 'text[]').notNullable().defaultTo('{}');
    t.specificType('hazards', 'text[]').notNullable().defaultTo('{}');
    t.specificType('file_ids', 'uuid[]').notNullable().defaultTo('{}');
    t.integer('author_id').references('users.id').onDelete('SET NULL');
    t.text('note');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['article_id', 'number']);
  });
  await knex.schema.alterTable('articles', (t) => {
    t.foreign('head_revision_id').references('article_revisions.id').deferrable('deferred');
    t.foreign('published_revision_id').references('article_revisions.id').deferrable('deferred');
  });

  await knex.schema.createTable('article_events', (t) => {
    t.increments('id');
    t.integer('article_id').notNullable().references('articles.id').onDelete('CASCADE');
    t.text('kind').notNullable(); // created | submitted | approved | changes_requested | archived | restored | reverted
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.integer('revision_number');
    t.text('comment');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create index article_events_article on article_events (article_id, created_at)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('article_events');
  await knex.schema.alterTable('articles', (t) => {
    t.dropForeign(['head_revision_id']);
    t.dropForeign(['published_revision_id']);
  });
  await knex.schema.dropTable('article_revisions');
  await knex.schema.dropTable('articles');
  await knex.schema.dropTable('tags');
  await knex.schema.dropTable('files');
}
