// Demo mode only: everything in content/ (drawings, articles, guides) for the demo organisation,
// so a fresh demo shows the whole set. Idempotent item by item (see content/lib/load.ts); the
// year of history is a separate seed that builds on this one (content/README.md).
import type { Knex } from 'knex';
import { loadDemoContent } from '../content/lib/load';
import { DEMO_ORGANISATION } from './01-demo-organisation';

export async function seed(knex: Knex): Promise<void> {
  if (process.env.BEADPATH_DEMO !== '1') return;
  const org = await knex('organisations').where({ name: DEMO_ORGANISATION }).first();
  if (!org) return;
  await loadDemoContent(knex, { organisationId: org.id });
}
