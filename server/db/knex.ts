// One Knex pool per process; migrations are TypeScript files run through tsx.
import knexFactory, { type Knex } from 'knex';
import { fileURLToPath } from 'node:url';

export type Db = Knex;

export const migrationsDir = fileURLToPath(new URL('../../migrations', import.meta.url));

interface LogSink {
  warn: (msg: string) => void;
}

export function createDb(url: string, opts: { max?: number; log?: LogSink } = {}): Db {
  const warn = (m: unknown) => (opts.log ? opts.log.warn(String(m)) : undefined);
  return knexFactory({
    // Knex prints pool trouble to the console by default; it goes to the app's log instead.
    log: { warn, error: warn, deprecate: warn, debug: () => {} },
    client: 'pg',
    connection: { connectionString: url },
    // Idle connections die when PostgreSQL restarts; pg reports it and the pool makes new ones.
    pool: { min: 0, max: opts.max ?? 10, idleTimeoutMillis: 10000 },
    acquireConnectionTimeout: 10000,
  });
}

export async function migrateLatest(db: Db): Promise<void> {
  await db.migrate.latest({ directory: migrationsDir, loadExtensions: ['.ts'] });
}

export async function rollback(db: Db): Promise<void> {
  await db.migrate.rollback({ directory: migrationsDir, loadExtensions: ['.ts'] });
}
