// Support desk cases with their timeline, the walks run for them and in-app notices; the mail
// outbox (every message Beadpath sends or tries to send), what the local fake SMTP server
// received, and one-time password-reset tokens.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cases', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('caller_name').notNullable();
    t.text('caller_company');
    t.text('caller_phone');
    t.text('caller_email');
    t.text('site');
    t.text('line');
    t.text('applicator');
    t.integer('applicator_id');
    t.text('symptom').notNullable();
    t.text('priority').notNullable().defaultTo('normal');
    t.text('status').notNullable().defaultTo('new');
    t.integer('assignee_id').references('users.id').onDelete('SET NULL');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    // Kept once set: authors and admins go on seeing a case that was handed off after it is resolved.
    t.timestamp('handed_off_at', { useTz: true });
    t.timestamp('resolved_at', { useTz: true });
    t.timestamp('closed_at', { useTz: true });
    t.timestamps(true, true);
  });
  // The registered valve is optional: the link holds only when the applicators table is there.
  if (await knex.schema.hasTable('applicators')) {
    await knex.raw('alter table cases add constraint cases_applicator_fk foreign key (applicator_id) references applicators(id) on delete set null');
  }
  await knex.raw(`alter table cases add constraint cases_status_valid check (status in ('new','in-progress','waiting','handed-off','resolved','closed'))`);
  await knex.raw(`alter table cases add constraint cases_priority_valid check (priority in ('low','normal','high','urgent'))`);
  await knex.raw('create index cases_org_status on cases (organisation_id, status, created_at)');
  await knex.raw('create index cases_assignee on cases (assignee_id) where assignee_id is not null');

  await knex.schema.createTable('mail_messages', (t) => {
    t.increments('id');
    t.integer('organisation_id').references('organisations.id').onDelete('CASCADE');
    t.text('kind').notNullable();
    t.text('to_address').notNullable();
    t.text('from_address').notNullable();
    t.text('reply_to');
    t.text('subject').notNullable();
    t.text('text_body').notNullable();
    t.text('html_body');
    t.integer('case_id').references('cases.id').onDelete('SET NULL');
    // Holds a one-time link: hidden on the outbox unless the local fake is the only mailbox.
    t.boolean('sensitive').notNullable().defaultTo(false);
    t.text('status').notNullable().defaultTo('queued');
    t.integer('attempts').notNullable().defaultTo(0);
    t.text('last_error');
    t.text('smtp_response');
    // Made with the message, so re-queueing it after a crash can never create a second job.
    t.uuid('job_id').notNullable();
    t.text('message_id').notNullable().unique();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('sent_at', { useTz: true });
  });
  await knex.raw(`alter table mail_messages add constraint mail_messages_status_valid check (status in ('queued','sending','retrying','sent','failed'))`);
  await knex.raw('create index mail_messages_org_created on mail_messages (organisation_id, created_at desc)');
  await knex.raw(`create index mail_messages_pending on mail_messages (created_at) where status = 'queued'`);

  await knex.schema.createTable('case_events', (t) => {
    t.bigIncrements('id');
    t.integer('case_id').notNullable().references('cases.id').onDelete('CASCADE');
    t.text('kind').notNullable();
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.text('text');
    t.text('from_status');
    t.text('to_status');
    t.integer('walk_id').references('walks.id').onDelete('SET NULL');
    t.integer('mail_message_id').references('mail_messages.id').onDelete('SET NULL');
    t.integer('assignee_id').references('users.id').onDelete('SET NULL');
    t.specificType('file_ids', 'uuid[]').notNullable().defaultTo('{}');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`alter table case_events add constraint case_events_kind_valid check (kind in ('created','edited','note','status','assigned','walk','handoff','email'))`);
  await knex.raw('create index case_events_case on case_events (case_id, id)');

  await knex.schema.createTable('case_walks', (t) => {
    t.integer('case_id').notNullable().references('cases.id').onDelete('CASCADE');
    // One case per walk: a walk is the record of one conversation.
    t.integer('walk_id').notNullable().unique().references('walks.id').onDelete('CASCADE');
    t.integer('linked_by').references('users.id').onDelete('SET NULL');
    t.timestamp('linked_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['case_id', 'walk_id']);
  });

  await knex.schema.createTable('notices', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.integer('case_id').references('cases.id').onDelete('CASCADE');
    t.text('kind').notNullable();
    t.text('title').notNullable();
    t.text('body');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('read_at', { useTz: true });
  });
  await knex.raw('create index notices_user on notices (user_id, created_at desc)');

  await knex.schema.createTable('mail_captures', (t) => {
    t.increments('id');
    t.text('message_id');
    t.text('envelope_from');
    t.specificType('envelope_to', 'text[]').notNullable();
    t.text('subject');
    t.text('text_body');
    t.text('html_body');
    t.text('raw').notNullable();
    t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create index mail_captures_message on mail_captures (message_id)');

  await knex.schema.createTable('password_resets', (t) => {
    t.increments('id');
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.text('token_hash').notNullable().unique();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create index password_resets_user on password_resets (user_id)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('password_resets');
  await knex.schema.dropTable('mail_captures');
  await knex.schema.dropTable('notices');
  await knex.schema.dropTable('case_walks');
  await knex.schema.dropTable('case_events');
  await knex.schema.dropTable('mail_messages');
  await knex.schema.dropTable('cases');
  // pg-boss keeps its jobs in its own schema, created when the mail queue first starts.
  await knex.raw('drop schema if exists pgboss cascade');
}
