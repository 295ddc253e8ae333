// A fresh database for one test file, cloned from the migrated template, dropped afterwards.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { inject } from 'vitest';
import { createDb, type Db } from '../../server/db/knex';

async function admin<T>(fn: (c: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: inject('pgAdminUrl') });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

export async function createTestDatabase(): Promise<{ db: Db; url: string; drop: () => Promise<void> }> {
  const name = `t_${randomBytes(6).toString('hex')}`;
  await admin((c) => c.query(`create database "${name}" template "${inject('pgTemplate')}"`));
  const url = inject('pgUrlPrefix') + name;
  const db = createDb(url, { max: 5 });
  return {
    db,
    url,
    drop: async () => {
      await db.destroy();
      await admin((c) => c.query(`drop database if exists "${name}" with (force)`));
    },
  };
}
