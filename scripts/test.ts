// `npm test`: makes sure the machine has what the tests need (Debian's PostgreSQL and Chromium),
// builds the client, then runs every Vitest project. Extra arguments go to Vitest.
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { buildClientIfStale } from './lib/build-client';

const isRoot = process.getuid?.() === 0;

function need(what: string, present: boolean, packages: string[]) {
  if (present) return;
  if (!isRoot) {
    console.error(`${what} is missing. Run as root:\n  apt-get update && apt-get install -y ${packages.join(' ')}`);
    process.exit(1);
  }
  console.log(`${what} is missing: installing ${packages.join(' ')} with apt-get...`);
  execFileSync('apt-get', ['update'], { stdio: 'inherit' });
  execFileSync('apt-get', ['install', '-y', ...packages], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
}

const hasPostgres = existsSync('/usr/lib/postgresql') && readdirSync('/usr/lib/postgresql').some((v) => existsSync(`/usr/lib/postgresql/${v}/bin/initdb`));
need('PostgreSQL', hasPostgres || Boolean(process.env.DATABASE_URL), ['postgresql', 'postgresql-contrib']);
need('Chromium', existsSync(process.env.CHROMIUM || '/usr/bin/chromium'), ['chromium']);

await buildClientIfStale();

const vitest = spawn(process.execPath, ['node_modules/vitest/vitest.mjs', 'run', '--reporter=default', '--reporter=./tests/setup/summary-reporter.ts', ...process.argv.slice(2)], {
  stdio: 'inherit',
});
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => vitest.kill(sig));
vitest.on('exit', (code) => process.exit(code ?? 1));
