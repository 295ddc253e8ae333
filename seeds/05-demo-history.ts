// Demo mode only: a year of history for the demo organisation (the scenario's plants, lines and
// valves, their counter readings, service records and walks), generated from a fixed seed so
// every fresh demo tells the same stories, dated back from the day it runs. Skipped when the
// organisation already has its history. See content/README.md and content/lib/history.ts.
import type { Knex } from 'knex';
import { HISTORY_SEED, generateHistory, historyContext } from '../content/lib/history';
import { DEMO_ORGANISATION } from './01-demo-organisation';

export async function seed(knex: Knex): Promise<void> {
  if (process.env.BEADPATH_DEMO !== '1') return;
  const org = await knex('organisations').where({ name: DEMO_ORGANISATION }).first();
  if (!org) return;
  // The cheap check first, so a restart does not read the content files for nothing.
  if (
    await knex('walks')
      .where({ organisation_id: org.id })
      .where('started_at', '<', new Date(Date.now() - 30 * 86_400_000))
      .first('id')
  )
    return;
  // One transaction: a year half written would make the next start skip the rest.
  await knex.transaction(async (trx) => generateHistory(await historyContext(trx, org.id, { seed: HISTORY_SEED })));
}
