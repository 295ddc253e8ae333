// A user's unit system becomes optional: null means "follow the organisation's default", which an
// admin sets on the settings page. Existing choices are kept; new users follow the organisation.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`alter table users alter column unit_system drop not null`);
  await knex.raw(`alter table users alter column unit_system drop default`);
}

export async function down(knex: Knex): Promise<void> {
  // Those who followed the organisation keep seeing what they saw: its default becomes their own.
  await knex.raw(`
    update users u
       set unit_system = case when o.settings->>'defaultUnitSystem' = 'imperial' then 'imperial' else 'metric' end
      from organisations o
     where o.id = u.organisation_id and u.unit_system is null`);
  await knex.raw(`alter table users alter column unit_system set default 'metric'`);
  await knex.raw(`alter table users alter column unit_system set not null`);
}
