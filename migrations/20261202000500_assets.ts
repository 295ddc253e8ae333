// Sites, lines and applicators with their organisation-defined fields, cycle counter readings and
// service events; walks gain a link to the applicator they were run on.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sites', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('name').notNullable();
    t.text('address');
    t.text('contact');
    t.timestamps(true, true);
  });
  await knex.raw('create unique index sites_name_unique on sites (organisation_id, lower(name))');

  await knex.schema.createTable('lines', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    // Restrict: a site with lines is emptied on purpose, never by accident.
    t.integer('site_id').notNullable().references('sites.id').onDelete('RESTRICT');
    t.text('name').notNullable();
    t.text('area');
    t.text('contact');
    t.timestamps(true, true);
  });
  await knex.raw('create unique index lines_name_unique on lines (site_id, lower(name))');

  await knex.schema.createTable('applicator_fields', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.text('name').notNullable();
    t.text('type').notNullable(); // text | number | date | yes-no
    t.text('unit');
    t.integer('position').notNullable().defaultTo(0);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create unique index applicator_fields_name_unique on applicator_fields (organisation_id, lower(name))');
  await knex.raw(`alter table applicator_fields add constraint applicator_fields_type_valid check (type in ('text','number','date','yes-no'))`);

  await knex.schema.createTable('applicators', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    // Kept beside line_id so the database itself holds "one tag per site".
    t.integer('site_id').notNullable().references('sites.id').onDelete('RESTRICT');
    t.integer('line_id').notNullable().references('lines.id').onDelete('RESTRICT');
    t.text('tag').notNullable();
    t.text('actuation').notNullable();
    t.text('coil_drive');
    t.double('air_pressure_bar');
    t.text('needle_tip');
    t.text('needle_material');
    t.text('seat_material');
    t.double('orifice_diameter_mm');
    t.text('nozzle');
    t.text('fluid_family');
    t.text('fluid_name');
    t.double('viscosity_mpa_s');
    t.double('viscosity_temperature_c');
    t.double('density_g_cm3');
    t.boolean('heated').notNullable().defaultTo(false);
    t.double('set_temperature_c');
    t.date('installed_on');
    t.text('status').notNullable().defaultTo('running');
    // The expected rate, used to carry the counter forward when no recent reading exists.
    t.double('cycles_per_minute');
    t.double('hours_per_day');
    t.double('days_per_week');
    // The organisation's own service intervals; null falls back to the common-practice defaults.
    t.bigInteger('seat_interval_cycles');
    t.bigInteger('needle_interval_cycles');
    t.bigInteger('seals_interval_cycles');
    // Values of the organisation's own fields, keyed by applicator_fields.id.
    t.jsonb('custom').notNullable().defaultTo('{}');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.timestamps(true, true);
  });
  await knex.raw('create unique index applicators_tag_unique on applicators (site_id, lower(tag))');
  await knex.raw('create index applicators_line on applicators (line_id)');
  await knex.raw(`alter table applicators add constraint applicators_actuation_valid check (actuation in ('electric','air-operated'))`);
  await knex.raw(`alter table applicators add constraint applicators_status_valid check (status in ('running','spare','out-for-repair','retired'))`);

  await knex.schema.createTable('counter_readings', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.integer('applicator_id').notNullable().references('applicators.id').onDelete('CASCADE');
    t.date('read_on').notNullable();
    t.bigInteger('count').notNullable();
    // The valve or its controller was replaced: this reading starts counting again.
    t.boolean('counter_reset').notNullable().defaultTo(false);
    t.text('source').notNullable().defaultTo('manual'); // manual | csv | service
    t.text('note');
    t.integer('recorded_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create index counter_readings_applicator on counter_readings (applicator_id, read_on, id)');
  await knex.raw('alter table counter_readings add constraint counter_readings_count_valid check (count >= 0)');

  await knex.schema.createTable('service_events', (t) => {
    t.increments('id');
    t.integer('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
    t.integer('applicator_id').notNullable().references('applicators.id').onDelete('CASCADE');
    t.date('performed_on').notNullable();
    t.specificType('actions', 'text[]').notNullable();
    t.text('other_action');
    t.text('cause_code');
    t.jsonb('parts').notNullable().defaultTo('[]');
    t.bigInteger('cycle_count');
    t.integer('reading_id').references('counter_readings.id').onDelete('SET NULL');
    t.text('performed_by');
    t.text('notes');
    t.specificType('file_ids', 'uuid[]').notNullable().defaultTo('{}');
    t.integer('walk_id').references('walks.id').onDelete('SET NULL');
    t.integer('recorded_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('create index service_events_applicator on service_events (applicator_id, performed_on)');
  // One walk leads to one service record: a double tap on a phone must not make two.
  await knex.raw('create unique index service_events_walk_unique on service_events (walk_id) where walk_id is not null');

  await knex.schema.alterTable('walks', (t) => {
    t.integer('applicator_id').references('applicators.id').onDelete('SET NULL');
  });
  await knex.raw('create index walks_applicator on walks (applicator_id, started_at) where applicator_id is not null');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop index if exists walks_applicator');
  await knex.schema.alterTable('walks', (t) => {
    t.dropColumn('applicator_id');
  });
  await knex.schema.dropTable('service_events');
  await knex.schema.dropTable('counter_readings');
  await knex.schema.dropTable('applicators');
  await knex.schema.dropTable('applicator_fields');
  await knex.schema.dropTable('lines');
  await knex.schema.dropTable('sites');
}
