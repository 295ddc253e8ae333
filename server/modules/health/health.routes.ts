// /api/health: is the server up and can it reach the database.
import type { Knex } from 'knex';
import { ApiRouter } from '../../lib/routes';

export function healthRoutes(deps: { db: Knex; version: string }) {
  const r = new ApiRouter('/api/health');
  r.get('/', 'public', async (_req, res) => {
    const started = Date.now();
    let database: 'ok' | 'down' = 'ok';
    try {
      await deps.db.raw('select 1');
    } catch {
      database = 'down';
    }
    res.status(database === 'ok' ? 200 : 503).json({
      status: database === 'ok' ? 'ok' : 'degraded',
      database,
      databaseLatencyMs: Date.now() - started,
      version: deps.version,
    });
  });
  return r;
}
