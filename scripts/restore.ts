// `npm run restore FILE [-- --into NAME]`: a backup into an empty database (DATABASE_URL, or NAME in
// the private cluster, created when missing) and an empty upload storage (the FILES_DIR folder, or
// the S3 bucket and prefix when S3_BUCKET is set); refuses anything else.
import { defaultFilesDir } from '../server/app';
import { loadStorageConfig } from '../server/config/env';
import { storageFor } from '../server/lib/storage';
import { restore } from './lib/backup';
import { localDatabaseUrl } from './lib/local-env';

const file = process.argv[2];
if (!file || file.startsWith('--')) {
  console.error('usage: npm run restore FILE [-- --into DATABASE_NAME]');
  process.exit(2);
}
const into = process.argv.indexOf('--into');
const databaseUrl = await localDatabaseUrl(into > 0 ? process.argv[into + 1] : 'beadpath');
try {
  const manifest = await restore({ file, databaseUrl, storage: storageFor(loadStorageConfig(process.env), defaultFilesDir) });
  console.log(`restored ${file} (taken ${manifest.createdAt}): ${Object.keys(manifest.tables).length} tables and ${Object.keys(manifest.files).length} files, every checksum matching`);
} catch (err) {
  console.error(`restore refused: ${(err as Error).message}`);
  process.exit(1);
}
