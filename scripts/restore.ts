// `npm run restore FILE [-- --into NAME]`: a backup into an empty database (DATABASE_URL, or NAME in
// the private cluster, created when missing) and an empty files folder; refuses anything else.
import { defaultFilesDir } from '../server/app';
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
  const manifest = await restore({ file, databaseUrl, filesDir: process.env.FILES_DIR ?? defaultFilesDir });
  console.log(`restored ${file} (taken ${manifest.createdAt}): ${Object.keys(manifest.tables).length} tables and ${Object.keys(manifest.files).length} files, every checksum matching`);
} catch (err) {
  console.error(`restore refused: ${(err as Error).message}`);
  process.exit(1);
}
