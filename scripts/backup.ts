// `npm run backup [-- --out FILE]`: the database and the uploaded files (from the folder, or the S3
// bucket when S3_BUCKET is set) in one checked archive.
import { join } from 'node:path';
import { defaultFilesDir } from '../server/app';
import { loadStorageConfig } from '../server/config/env';
import { storageFor } from '../server/lib/storage';
import { backup } from './lib/backup';
import { localDatabaseUrl, projectRoot } from './lib/local-env';

const outFlag = process.argv.indexOf('--out');
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\..*/, '').replace('T', '-');
const out = outFlag > 0 ? process.argv[outFlag + 1] : join(projectRoot, '.data', 'backups', `beadpath-${stamp}.tar.gz`);
const manifest = await backup({ databaseUrl: await localDatabaseUrl(), storage: storageFor(loadStorageConfig(process.env), defaultFilesDir), out });
const rows = Object.values(manifest.tables).reduce((n, t) => n + t.rows, 0);
console.log(`backup written: ${out}\n  ${Object.keys(manifest.tables).length} tables, ${rows} rows, ${Object.keys(manifest.files).length} files; checksum in ${out}.sha256`);
