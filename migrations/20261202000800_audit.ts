// The audit log: who changed what, when, with a short before/after summary. Append-only: the
// application only inserts and reads, and a trigger refuses any update or delete of a row.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_events', (t) => {
    t.bigIncrements('id');
    // No cascade: deleting an organisation must not quietly erase its history.
    t.integer('organisation_id').notNullable().references('organisations.id');
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.text('action').notNullable();
    t.text('entity_kind').notNullable();
    t.text('entity_id');
    t.jsonb('before');
    t.jsonb('after');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create index audit_events_org_time on audit_events (organisation_id, created_at desc, id desc)');
  await knex.raw(`
    create function audit_events_append_only() returns trigger language plpgsql as $$
    begin
      -- A user being deleted may clear the link to them; nothing else about a row may change.
      if tg_op = 'UPDATE' and new.user_id is null and old.user_id is not null
         and (new.id, new.organisation_id, new.action, new.entity_kind, new.entity_id, new.before, new.after, new.created_at)
             is not distinct from (old.id, old.organisation_id, old.action, old.entity_kind, old.entity_id, old.before, old.after, old.created_at) then
        return new;
      end if;
      raise exception 'audit_events is append-only (% refused)', tg_op using errcode = 'insufficient_privilege';
    end $$`);
  await knex.raw('create trigger audit_events_append_only before update or delete on audit_events for each row execute function audit_events_append_only()');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_events');
  await knex.raw('drop function if exists audit_events_append_only()');
}
