// The real server as its own process, for benchmarks and scripted fault checks: started on a free
// loopback port in production mode, waited for until /api/health answers, never outliving the script.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';

const root = resolve(import.meta.dirname, '..', '..');

export function freePort(): Promise<number> {
  return new Promise((done) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => done(port));
    });
  });
}

export interface ServerProcess {
  child: ChildProcess;
  base: string;
  /** The process's own output lines when `captureLog` was asked for (else it goes to this terminal). */
  log: string[];
  stop: () => Promise<void>;
}

/**
 * `env` overrides the defaults (a random session secret, warn-level logs, no Meilisearch).
 * BENCH_NODE_FLAGS passes extra Node flags to the server, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof".
 */
export async function startServerProcess(env: Record<string, string>, opts: { captureLog?: boolean } = {}): Promise<ServerProcess> {
  const port = await freePort();
  const flags = (process.env.BENCH_NODE_FLAGS ?? '').split(/\s+/).filter(Boolean);
  const log: string[] = [];
  const child = spawn(process.execPath, [...flags, '--import', 'tsx', join(root, 'server/index.ts')], {
    cwd: root,
    env: {
      ...process.env,
      SESSION_SECRET: randomBytes(32).toString('hex'),
      HOST: '127.0.0.1',
      LOG_LEVEL: 'warn',
      NODE_ENV: 'production',
      MEILI_URL: '',
      MEILI_API_KEY: '',
      ...env,
      PORT: String(port),
    },
    stdio: opts.captureLog ? ['ignore', 'pipe', 'pipe'] : ['ignore', 'inherit', 'inherit'],
  });
  // Should the script die on an error, no server may outlive it.
  process.once('exit', () => child.kill());
  if (opts.captureLog) for (const s of [child.stdout!, child.stderr!]) s.on('data', (b: Buffer) => log.push(...b.toString().split('\n').filter(Boolean)));
  const base = `http://127.0.0.1:${port}`;
  const stop = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    await new Promise((r) => (child.once('exit', r), child.kill('SIGTERM')));
  };
  for (let i = 0; i < 300; i++) {
    if (child.exitCode !== null) break;
    try {
      if ((await fetch(`${base}/api/health`)).ok) return { child, base, log, stop };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop();
  throw new Error(`the server did not start within 30 s${log.length ? `:\n${log.slice(-20).join('\n')}` : ''}`);
}
