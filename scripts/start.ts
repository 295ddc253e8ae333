// `npm start`: Beadpath with demo data on a private PostgreSQL (or DATABASE_URL), built client, one process.
import { createDb, migrateLatest } from '../server/db/knex';
import { runSeeds } from '../server/db/seed';
import { startServer } from '../server/index';
import { DEMO_PASSWORD, DEMO_USERS } from '../seeds/01-demo-organisation';
import { buildClientIfStale } from './lib/build-client';
import { localDatabaseUrl, sessionSecret } from './lib/local-env';

const dev = process.argv.includes('--dev');
process.env.NODE_ENV ??= dev ? 'development' : 'production';
process.env.BEADPATH_DEMO ??= '1';
process.env.DATABASE_URL = await localDatabaseUrl();
process.env.SESSION_SECRET ??= sessionSecret();

if (!dev) await buildClientIfStale();

const db = createDb(process.env.DATABASE_URL, { max: 2 });
await migrateLatest(db);
if (process.env.BEADPATH_DEMO === '1') await runSeeds(db);
await db.destroy();

const { port, shutdown } = await startServer();
const url = `http://localhost:${port}`;
console.log(`\nBeadpath is running at ${url}`);
if (process.env.BEADPATH_DEMO === '1') {
  console.log(`Demo sign-ins (password "${DEMO_PASSWORD}"):`);
  for (const u of DEMO_USERS) console.log(`  ${u.email.padEnd(22)} ${u.roles.join(', ')}`);
}
if (process.env.FAKE_SMTP === '1' || (!process.env.SMTP_URL && !process.env.SMTP_HOST && process.env.FAKE_SMTP !== '0'))
  console.log(`E-mails are kept by the local fake SMTP server: an admin sees them at ${url}/admin/outbox`);
console.log('Stop with Ctrl+C (PostgreSQL keeps running; `npm run db:stop` stops it).\n');
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.once(sig, () => void shutdown(sig).then(() => process.exit(0)));
