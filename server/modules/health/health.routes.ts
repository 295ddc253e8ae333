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

/**
 * Floors for the load benchmark: a signed-in route that does nothing and one that runs one
 * trivial query, so every other route's throughput can be read as a share of what the stack allows.
 * Mounted after sessions (unlike health), because a floor must pay for the session like real routes.
 */
export function floorRoutes(deps: { db: Knex }) {
  const r = new ApiRouter('/api/health/floor');
  r.get('/noop', 'signedIn', (_req, res) => {
    res.json({ ok: true });
  });
  r.get('/query', 'signedIn', async (_req, res) => {
    await deps.db.raw('select 1');
    res.json({ ok: true });
  });
  return r;
}
