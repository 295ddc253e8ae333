// Runs the seed files in seeds/ (demo data; each is idempotent and does nothing outside demo mode).
import { fileURLToPath } from 'node:url';
import type { Knex } from 'knex';

export const seedsDir = fileURLToPath(new URL('../../seeds', import.meta.url));

export async function runSeeds(db: Knex): Promise<void> {
  await db.seed.run({ directory: seedsDir, loadExtensions: ['.ts'] });
}
