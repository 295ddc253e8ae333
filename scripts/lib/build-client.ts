// Builds the client with Vite when dist/ is missing or older than the sources.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { projectRoot } from './local-env';

function newest(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  return readdirSync(path).reduce((m, name) => Math.max(m, newest(join(path, name))), st.mtimeMs);
}

export async function buildClientIfStale(log = console.log): Promise<void> {
  const built = join(projectRoot, 'dist', 'index.html');
  const sources = Math.max(...['src', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package-lock.json'].map((p) => newest(join(projectRoot, p))));
  if (existsSync(built) && statSync(built).mtimeMs >= sources) return;
  log('Building the client (vite build)...');
  const { build } = await import('vite');
  // Vite keeps a NODE_ENV it finds set, and Vitest sets 'test': without this, a build started from
  // a test run would ship React's development build (three times larger, much slower).
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({ root: projectRoot, logLevel: 'warn', mode: 'production' });
  } finally {
    if (nodeEnv === undefined) delete process.env.NODE_ENV;
    else process.env.NODE_ENV = nodeEnv;
  }
}
