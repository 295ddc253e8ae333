// Fills in what a local start needs when the environment does not say: a private PostgreSQL
// cluster and a session secret kept under .data/.
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ensureCluster, ensureDatabase } from './cluster';

export const projectRoot = resolve(import.meta.dirname, '..', '..');

export function sessionSecret(): string {
  const file = join(projectRoot, '.data', 'session-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(join(projectRoot, '.data'), { recursive: true });
  const secret = randomBytes(32).toString('base64url');
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

export async function localDatabaseUrl(database = 'beadpath'): Promise<string> {
  if (process.env.DATABASE_URL) return process.env.DATABASE_URL;
  const cluster = await ensureCluster({ name: 'pg', durable: true });
  ensureDatabase(cluster, database);
  return cluster.localUrlFor(database);
}
