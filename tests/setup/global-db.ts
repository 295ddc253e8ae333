// Vitest global setup: a private test cluster (fsync off, never the demo data) and a migrated
// template database per test project; each test file clones the template into its own database.
import type { TestProject } from 'vitest/node';
import { register } from 'tsx/esm/api';
import { createDb, migrateLatest } from '../../server/db/knex';
import { dropDatabase, ensureCluster, ensureDatabase } from '../../scripts/lib/cluster';

// Knex imports the .ts migrations and seeds with Node's own loader, which needs tsx registered.
register();

declare module 'vitest' {
  export interface ProvidedContext {
    pgAdminUrl: string;
    pgUrlPrefix: string;
    pgTemplate: string;
  }
}

export async function prepareTemplate(projectName: string) {
  const cluster = await ensureCluster({ name: 'pg-test', durable: false, log: () => {} });
  // TEST_DB_TAG lets several test runs share the cluster without dropping each other's template.
  const tag = (process.env.TEST_DB_TAG ?? '').replace(/[^a-z0-9]/gi, '').toLowerCase();
  const template = `tpl_${projectName}${tag ? `_${tag}` : ''}`;
  dropDatabase(cluster, template);
  ensureDatabase(cluster, template);
  const db = createDb(cluster.urlFor(template), { max: 1 });
  try {
    await migrateLatest(db);
  } finally {
    await db.destroy();
  }
  return { pgAdminUrl: cluster.urlFor('postgres'), pgUrlPrefix: cluster.urlFor(''), pgTemplate: template };
}

export default async function setup(project: TestProject) {
  const t = await prepareTemplate(project.name);
  project.provide('pgAdminUrl', t.pgAdminUrl);
  project.provide('pgUrlPrefix', t.pgUrlPrefix);
  project.provide('pgTemplate', t.pgTemplate);
}
