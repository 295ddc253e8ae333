// Indexes behind the insights queries, so a year of an organisation's findings, failure services
// and walks is read by range instead of scanning all history.
import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  // Covering: the Pareto, trend and repeat queries need only these columns of a finding.
  await knex.raw(
    `create index walks_insights_findings on walks (organisation_id, ended_at) include (cause_code, applicator_id, guide_id)
      where end_kind = 'finding' and cause_code is not null`,
  );
  await knex.raw(
    `create index service_events_insights_causes on service_events (organisation_id, performed_on) include (cause_code, applicator_id, walk_id)
      where cause_code is not null`,
  );
  await knex.raw('create index walks_insights_started on walks (organisation_id, started_at)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop index if exists walks_insights_started');
  await knex.raw('drop index if exists service_events_insights_causes');
  await knex.raw('drop index if exists walks_insights_findings');
}
