// Database chores: `migrate`, `rollback`, `seed` (demo data) and `stop` (the private cluster).
import { createDb, migrateLatest, rollback } from '../server/db/knex';
import { runSeeds } from '../server/db/seed';
import { stopCluster } from './lib/cluster';
import { localDatabaseUrl } from './lib/local-env';

const cmd = process.argv[2];
if (cmd === 'stop') {
  stopCluster('pg');
  stopCluster('pg-test');
} else if (cmd === 'migrate' || cmd === 'rollback' || cmd === 'seed') {
  const db = createDb(await localDatabaseUrl(), { max: 2 });
  try {
    if (cmd === 'migrate') await migrateLatest(db);
    if (cmd === 'rollback') await rollback(db);
    if (cmd === 'seed') {
      process.env.BEADPATH_DEMO ??= '1';
      await migrateLatest(db);
      await runSeeds(db);
    }
    console.log(`db ${cmd}: done`);
  } finally {
    await db.destroy();
  }
} else {
  console.error('usage: tsx scripts/db.ts migrate|rollback|seed|stop');
  process.exit(2);
}
