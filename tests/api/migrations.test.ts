// Every migration can be undone: all up, all down, all up again on an empty database.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { describe, expect, inject, it } from 'vitest';
import { register } from 'tsx/esm/api';
import { createDb, migrationsDir } from '../../server/db/knex';

// Knex imports the migration files with Node's own loader, which needs tsx for TypeScript.
register();

async function admin(sql: string) {
  const c = new pg.Client({ connectionString: inject('pgAdminUrl') });
  await c.connect();
  try {
    await c.query(sql);
  } finally {
    await c.end();
  }
}

describe('migrations', () => {
  it('when all migrations run up, down to nothing and up again on an empty database, then each step succeeds and the schema comes back', async () => {
    const name = `m_${randomBytes(5).toString('hex')}`;
    await admin(`create database "${name}"`);
    const db = createDb(inject('pgUrlPrefix') + name, { max: 1 });
    const opts = { directory: migrationsDir, loadExtensions: ['.ts'] };
    try {
      await db.migrate.latest(opts);
      const tables = async () =>
        (await db.raw(`select table_name from information_schema.tables where table_schema = 'public' and table_name not like 'knex_%' order by 1`)).rows.map(
          (r: { table_name: string }) => r.table_name,
        );
      const first = await tables();
      expect(first).toEqual(expect.arrayContaining(['users', 'articles', 'guides', 'walks', 'walk_answers']));
      await db.migrate.rollback(opts, true);
      expect(await tables()).toEqual([]);
      await db.migrate.latest(opts);
      expect(await tables()).toEqual(first);
    } finally {
      await db.destroy();
      await admin(`drop database if exists "${name}" with (force)`);
    }
  });
});
