// Organisations, users with roles, invitations and the session store.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('organisations', (t) => {
    t.increments('id');
    t.text('name').notNullable();
    t.jsonb('settings').notNullable().defaultTo('{}');
    t.timestamps(true, true);
  });

  await knex.schema.createTable('users', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('email').notNullable();
    t.text('name').notNullable();
    t.text('password_hash');
    t.specificType('roles', 'text[]').notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.text('unit_system').notNullable().defaultTo('metric');
    t.text('invite_token_hash');
    t.timestamp('invite_expires_at', { useTz: true });
    t.timestamp('last_sign_in_at', { useTz: true });
    t.timestamp('password_changed_at', { useTz: true });
    t.timestamps(true, true);
  });
  await knex.raw('create unique index users_email_unique on users (lower(email))');
  await knex.raw(`alter table users add constraint users_roles_valid check (
    cardinality(roles) >= 1 and roles <@ array['admin','author','technician','support','manager']::text[])`);
  await knex.raw(`alter table users add constraint users_unit_system_valid check (unit_system in ('metric','imperial'))`);

  // Same layout as connect-pg-simple's table.sql.
  await knex.raw(`create table user_sessions (
    sid varchar not null collate "default" primary key,
    sess json not null,
    expire timestamp(6) not null)`);
  await knex.raw('create index user_sessions_expire on user_sessions (expire)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('user_sessions');
  await knex.schema.dropTable('users');
  await knex.schema.dropTable('organisations');
}
