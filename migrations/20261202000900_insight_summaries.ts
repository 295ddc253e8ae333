// Summary tables behind the organisation-wide insights (cause counts per day, repeat chains, guide
// outcomes per day, stored forecast and reliability answers), the triggers that mark what changed
// so a queued refresh recomputes only those days and applicators, and the weekly digest's records.
import type { Knex } from 'knex';

// Statement-level triggers with transition tables: a bulk insert of a million walks marks its days
// in one statement instead of a million.
const WALK_FIELDS_CHANGED = `o.status is distinct from n.status or o.end_kind is distinct from n.end_kind or o.outcome is distinct from n.outcome
  or o.cause_code is distinct from n.cause_code or o.started_at is distinct from n.started_at or o.ended_at is distinct from n.ended_at
  or o.applicator_id is distinct from n.applicator_id or o.guide_id is distinct from n.guide_id or o.guide_version_id is distinct from n.guide_version_id
  or o.ended_at_step_id is distinct from n.ended_at_step_id
  or ((n.status = 'abandoned' or n.end_kind = 'abandoned') and o.current_step_id is distinct from n.current_step_id)`;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table insight_dirty (
      id bigserial primary key,
      organisation_id integer not null references organisations(id) on delete cascade,
      -- 'events': walks and failure causes (day-bound); 'assets': counters, services, applicators, settings
      kind text not null check (kind in ('events', 'assets')),
      day date,
      applicator_id integer,
      created_at timestamptz not null default now()
    )`);
  await knex.raw('create index insight_dirty_org on insight_dirty (organisation_id)');

  await knex.raw(`
    create table insight_refreshes (
      organisation_id integer primary key references organisations(id) on delete cascade,
      refreshed_at timestamptz not null,
      full_at timestamptz,
      took_ms integer not null default 0,
      requested_at timestamptz
    )`);

  // Finding causes from walks and failure causes from services, counted per UTC day.
  await knex.raw(`
    create table insight_cause_days (
      organisation_id integer not null references organisations(id) on delete cascade,
      day date not null,
      code text not null,
      src text not null check (src in ('walk', 'service')),
      n integer not null,
      primary key (organisation_id, day, code, src)
    )`);
  // One row per applicator, cause and day with the previous day the same cause was seen on it: a
  // repeat is a row whose previous day is close enough (plus n - 1 repeats on the day itself).
  await knex.raw(`
    create table insight_cause_chains (
      organisation_id integer not null references organisations(id) on delete cascade,
      applicator_id integer not null,
      code text not null,
      day date not null,
      n integer not null,
      -- of which from walks; the rest from services (the Pareto counts them apart)
      n_walk integer not null,
      prev_day date,
      primary key (organisation_id, applicator_id, code, day)
    )`);
  await knex.raw('create index insight_cause_chains_day on insight_cause_chains (organisation_id, day) include (applicator_id, code, n, prev_day)');
  // Per day: repeats on the day itself (n − 1 summed) and cum[g] = chain rows whose previous day is
  // 1..g days back, so a period's repeat count reads one row per day whatever the window.
  await knex.raw(`
    create table insight_repeat_days (
      organisation_id integer not null references organisations(id) on delete cascade,
      day date not null,
      same_day integer not null,
      cum integer[] not null,
      primary key (organisation_id, day)
    )`);

  // Walks per guide version and UTC day they were started.
  await knex.raw(`
    create table insight_guide_days (
      organisation_id integer not null references organisations(id) on delete cascade,
      guide_id integer not null,
      guide_version_id integer not null,
      day date not null,
      started integer not null,
      finished integer not null,
      fixed integer not null,
      not_fixed integer not null,
      fixed_by_other integer not null,
      abandoned integer not null,
      open integer not null,
      primary key (organisation_id, guide_version_id, day)
    )`);
  await knex.raw('create index insight_guide_days_day on insight_guide_days (organisation_id, day)');
  // Minutes from start to Finding, as counted values, so the median over any period is exact.
  await knex.raw(`
    create table insight_guide_durations (
      organisation_id integer not null references organisations(id) on delete cascade,
      guide_version_id integer not null,
      day date not null,
      minutes double precision not null,
      n integer not null,
      primary key (organisation_id, day, guide_version_id, minutes)
    )`);
  await knex.raw(`
    create table insight_guide_abandons (
      organisation_id integer not null references organisations(id) on delete cascade,
      guide_version_id integer not null,
      day date not null,
      step_id text not null,
      n integer not null,
      primary key (organisation_id, day, guide_version_id, step_id)
    )`);

  // Whole answers computed by the exact code (forecast, reliability per part and actuation).
  await knex.raw(`
    create table insight_snapshots (
      organisation_id integer not null references organisations(id) on delete cascade,
      kind text not null,
      key text not null,
      answer jsonb not null,
      computed_at timestamptz not null default now(),
      primary key (organisation_id, kind, key)
    )`);

  // The weekly digest: one run per organisation and week, and the managers who switched it off.
  await knex.raw(`
    create table insight_digest_runs (
      organisation_id integer not null references organisations(id) on delete cascade,
      week_start date not null,
      sent_at timestamptz not null default now(),
      recipients integer not null,
      primary key (organisation_id, week_start)
    )`);
  await knex.raw(`
    create table insight_digest_optouts (
      user_id integer primary key references users(id) on delete cascade,
      organisation_id integer not null references organisations(id) on delete cascade,
      created_at timestamptz not null default now()
    )`);

  // ---- What changed --------------------------------------------------------------------------
  await knex.raw(`
    create function insight_walks_inserted() returns trigger language plpgsql as $$
    begin
      insert into insight_dirty (organisation_id, kind, day, applicator_id)
      select distinct organisation_id, 'events', d, applicator_id
        from new_rows cross join lateral (values ((started_at at time zone 'UTC')::date), ((ended_at at time zone 'UTC')::date)) v(d)
       where d is not null;
      return null;
    end $$`);
  await knex.raw(`
    create function insight_walks_deleted() returns trigger language plpgsql as $$
    begin
      insert into insight_dirty (organisation_id, kind, day, applicator_id)
      select distinct organisation_id, 'events', d, applicator_id
        from old_rows cross join lateral (values ((started_at at time zone 'UTC')::date), ((ended_at at time zone 'UTC')::date)) v(d)
       where d is not null;
      return null;
    end $$`);
  await knex.raw(`
    create function insight_walks_updated() returns trigger language plpgsql as $$
    begin
      with changed as (
        select o.organisation_id as o_org, o.started_at as o_start, o.ended_at as o_end, o.applicator_id as o_app,
               n.organisation_id as n_org, n.started_at as n_start, n.ended_at as n_end, n.applicator_id as n_app, n.id
          from old_rows o join new_rows n on n.id = o.id
         where ${WALK_FIELDS_CHANGED}
      )
      insert into insight_dirty (organisation_id, kind, day, applicator_id)
      select distinct org, 'events', d, app from (
        select o_org as org, (o_start at time zone 'UTC')::date as d, o_app as app from changed
        union all select o_org, (o_end at time zone 'UTC')::date, o_app from changed
        union all select n_org, (n_start at time zone 'UTC')::date, n_app from changed
        union all select n_org, (n_end at time zone 'UTC')::date, n_app from changed
        -- a service recorded from the walk counts only while the walk names no cause itself
        union all select e.organisation_id, e.performed_on, e.applicator_id from service_events e join changed c on e.walk_id = c.id
      ) x where d is not null;
      return null;
    end $$`);
  await knex.raw('create trigger insight_walks_ins after insert on walks referencing new table as new_rows for each statement execute function insight_walks_inserted()');
  await knex.raw('create trigger insight_walks_upd after update on walks referencing old table as old_rows new table as new_rows for each statement execute function insight_walks_updated()');
  await knex.raw('create trigger insight_walks_del after delete on walks referencing old table as old_rows for each statement execute function insight_walks_deleted()');

  // Service events: their causes (events) and the forecast and reliability they feed (assets).
  for (const [op, table] of [
    ['ins', 'new_rows'],
    ['del', 'old_rows'],
  ] as const) {
    await knex.raw(`
      create function insight_services_${op}() returns trigger language plpgsql as $$
      begin
        insert into insight_dirty (organisation_id, kind, day, applicator_id)
        select distinct organisation_id, k, performed_on, applicator_id from ${table} cross join (values ('events'), ('assets')) v(k);
        return null;
      end $$`);
  }
  await knex.raw(`
    create function insight_services_upd() returns trigger language plpgsql as $$
    begin
      insert into insight_dirty (organisation_id, kind, day, applicator_id)
      select distinct organisation_id, k, performed_on, applicator_id
        from (select organisation_id, performed_on, applicator_id from old_rows union all select organisation_id, performed_on, applicator_id from new_rows) x
        cross join (values ('events'), ('assets')) v(k);
      return null;
    end $$`);
  await knex.raw('create trigger insight_services_ins after insert on service_events referencing new table as new_rows for each statement execute function insight_services_ins()');
  await knex.raw(
    'create trigger insight_services_upd after update on service_events referencing old table as old_rows new table as new_rows for each statement execute function insight_services_upd()',
  );
  await knex.raw('create trigger insight_services_del after delete on service_events referencing old table as old_rows for each statement execute function insight_services_del()');

  // Counters, applicators, sites and lines: only the forecast and reliability answers depend on them.
  for (const table of ['counter_readings', 'applicators', 'sites', 'lines']) {
    for (const [op, rows] of [
      ['ins', 'new'],
      ['upd', 'new'],
      ['del', 'old'],
    ] as const) {
      const event = op === 'ins' ? 'insert' : op === 'upd' ? 'update' : 'delete';
      await knex.raw(`
        create function insight_${table}_${op}() returns trigger language plpgsql as $$
        begin
          insert into insight_dirty (organisation_id, kind) select distinct organisation_id, 'assets' from ${rows}_rows;
          return null;
        end $$`);
      await knex.raw(`create trigger insight_${table}_${op} after ${event} on ${table} referencing ${rows} table as ${rows}_rows for each statement execute function insight_${table}_${op}()`);
    }
  }
  // The organisation's default service intervals feed the forecast and the reliability comparison.
  await knex.raw(`
    create function insight_organisations_upd() returns trigger language plpgsql as $$
    begin
      insert into insight_dirty (organisation_id, kind)
      select n.id, 'assets' from new_rows n join old_rows o on o.id = n.id where o.settings is distinct from n.settings;
      return null;
    end $$`);
  await knex.raw(
    'create trigger insight_organisations_upd after update on organisations referencing old table as old_rows new table as new_rows for each statement execute function insight_organisations_upd()',
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop trigger if exists insight_organisations_upd on organisations');
  await knex.raw('drop function if exists insight_organisations_upd()');
  for (const table of ['counter_readings', 'applicators', 'sites', 'lines']) {
    for (const op of ['ins', 'upd', 'del']) {
      await knex.raw(`drop trigger if exists insight_${table}_${op} on ${table}`);
      await knex.raw(`drop function if exists insight_${table}_${op}()`);
    }
  }
  for (const op of ['ins', 'upd', 'del']) {
    await knex.raw(`drop trigger if exists insight_services_${op} on service_events`);
    await knex.raw(`drop function if exists insight_services_${op}()`);
  }
  await knex.raw('drop trigger if exists insight_walks_ins on walks');
  await knex.raw('drop trigger if exists insight_walks_upd on walks');
  await knex.raw('drop trigger if exists insight_walks_del on walks');
  await knex.raw('drop function if exists insight_walks_inserted()');
  await knex.raw('drop function if exists insight_walks_updated()');
  await knex.raw('drop function if exists insight_walks_deleted()');
  for (const t of [
    'insight_digest_optouts',
    'insight_digest_runs',
    'insight_snapshots',
    'insight_guide_abandons',
    'insight_guide_durations',
    'insight_guide_days',
    'insight_repeat_days',
    'insight_cause_chains',
    'insight_cause_days',
    'insight_refreshes',
    'insight_dirty',
  ]) {
    await knex.raw(`drop table if exists ${t}`);
  }
}
