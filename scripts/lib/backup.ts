// One-file backups: a pg_dump taken in the same snapshot as per-table counts and checksums, the
// uploaded files (read through the storage module, so from the folder or the S3 bucket alike), and
// a manifest with SHA-256 of every part; restore checks all of it on the way back.
import { execFileSync, spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createReadStream, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve, sep } from 'node:path';
import pg from 'pg';
import { localStorage, type FileStorage } from '../../server/lib/storage';

export const MANIFEST_FORMAT = 'beadpath-backup';

export interface TableDigest {
  rows: number;
  md5: string;
}

export interface Manifest {
  format: typeof MANIFEST_FORMAT;
  formatVersion: 1;
  createdAt: string;
  database: { file: string; sha256: string; serverVersion: string };
  tables: Record<string, TableDigest>;
  files: Record<string, string>;
}

/** Debian's PostgreSQL tools: PG_BINDIR, else the newest version under /usr/lib/postgresql (as the cluster script finds them). */
export function pgTool(tool: string): string {
  const fromEnv = process.env.PG_BINDIR;
  if (fromEnv && existsSync(join(fromEnv, tool))) return join(fromEnv, tool);
  const base = '/usr/lib/postgresql';
  const versions = existsSync(base)
    ? readdirSync(base)
        .filter((v) => existsSync(join(base, v, 'bin', tool)))
        .sort((a, b) => Number(b) - Number(a))
    : [];
  if (!versions.length) throw new Error(`${tool} was not found: install Debian's postgresql-client or set PG_BINDIR`);
  return join(base, versions[0], 'bin', tool);
}

export async function sha256File(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/** Row count and a checksum of every row's text, per table of the public schema, in the client's current snapshot. */
export async function tableDigests(client: pg.Client | pg.PoolClient): Promise<Record<string, TableDigest>> {
  const { rows: tables } = await client.query(`select tablename from pg_tables where schemaname = 'public' order by tablename`);
  const out: Record<string, TableDigest> = {};
  for (const { tablename } of tables as { tablename: string }[]) {
    const { rows } = await client.query(`select count(*)::int as n, md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as h from public."${tablename}" x`);
    out[tablename] = { rows: rows[0].n, md5: rows[0].h };
  }
  return out;
}

function run(cmd: string, args: string[]): Promise<void> {
  return new Promise((done, fail) => {
    const child = spawn(cmd, args, { stdio: ['ignore', 'ignore', 'pipe'] });
    let err = '';
    child.stderr.on('data', (d) => (err += d));
    child.on('error', fail);
    child.on('close', (code) => (code === 0 ? done() : fail(new Error(`${cmd.split('/').pop()} failed (${code}): ${err.trim()}`))));
  });
}

/** Where the uploads are: a FileStorage (folder or S3), or a folder path. */
type FilesSource = { storage: FileStorage } | { filesDir: string };
const storageOf = (o: FilesSource) => ('storage' in o ? o.storage : localStorage(o.filesDir));

export async function backup(opts: FilesSource & { databaseUrl: string; out: string }): Promise<Manifest> {
  const storage = storageOf(opts);
  const work = mkdtempSync(join(tmpdir(), 'beadpath-backup-'));
  const client = new pg.Client({ connectionString: opts.databaseUrl });
  await client.connect();
  try {
    // pg_dump joins this exported snapshot, so the dump and the checksums describe the same moment.
    await client.query('begin isolation level repeatable read read only');
    const snapshot = (await client.query('select pg_export_snapshot() as s')).rows[0].s as string;
    const serverVersion = (await client.query('show server_version')).rows[0].server_version as string;
    const dumpFile = join(work, 'database.dump');
    const dumping = run(pgTool('pg_dump'), ['--format=custom', '--no-owner', '--no-privileges', `--snapshot=${snapshot}`, `--file=${dumpFile}`, `--dbname=${opts.databaseUrl}`]);
    const tables = await tableDigests(client);
    await dumping;
    await client.query('commit');

    // Stored files never change once written, so copying them after the snapshot misses nothing it refers to.
    const files: Record<string, string> = {};
    for (const rel of await storage.list()) {
      const target = resolve(work, 'files', rel);
      if (!target.startsWith(resolve(work, 'files') + sep)) throw new Error(`The storage holds a key that is not a plain path: ${rel}`);
      const data = await storage.get(rel);
      if (!data) continue; // deleted since it was listed
      mkdirSync(dirname(target), { recursive: true });
      writeFileSync(target, data);
      files[rel] = await sha256File(target);
    }
    const manifest: Manifest = {
      format: MANIFEST_FORMAT,
      formatVersion: 1,
      createdAt: new Date().toISOString(),
      database: { file: 'database.dump', sha256: await sha256File(dumpFile), serverVersion },
      tables,
      files,
    };
    writeFileSync(join(work, 'manifest.json'), JSON.stringify(manifest, null, 2));
    mkdirSync(dirname(resolve(opts.out)), { recursive: true });
    execFileSync('tar', ['-czf', resolve(opts.out), '-C', work, '.']);
    writeFileSync(`${resolve(opts.out)}.sha256`, `${await sha256File(resolve(opts.out))}  ${resolve(opts.out).split(sep).pop()}\n`);
    return manifest;
  } finally {
    await client.end().catch(() => {});
    rmSync(work, { recursive: true, force: true });
  }
}

export async function restore(opts: FilesSource & { file: string; databaseUrl: string }): Promise<Manifest> {
  const storage = storageOf(opts);
  const sumFile = `${opts.file}.sha256`;
  if (existsSync(sumFile)) {
    const expected = readFileSync(sumFile, 'utf8').split(/\s+/)[0];
    if ((await sha256File(opts.file)) !== expected) throw new Error(`The archive does not match its checksum in ${sumFile}; it is damaged or was changed.`);
  }
  const work = mkdtempSync(join(tmpdir(), 'beadpath-restore-'));
  const client = new pg.Client({ connectionString: opts.databaseUrl });
  try {
    execFileSync('tar', ['-xzf', resolve(opts.file), '-C', work, '--no-same-owner']);
    const manifest = JSON.parse(readFileSync(join(work, 'manifest.json'), 'utf8')) as Manifest;
    if (manifest.format !== MANIFEST_FORMAT) throw new Error('This is not a Beadpath backup (no manifest).');
    const dumpFile = join(work, manifest.database.file);
    if ((await sha256File(dumpFile)) !== manifest.database.sha256) throw new Error('The database dump does not match its checksum in the manifest.');
    for (const [rel, sum] of Object.entries(manifest.files)) {
      const p = resolve(work, 'files', rel);
      if (!p.startsWith(resolve(work, 'files') + sep)) throw new Error(`The manifest names a file outside the archive: ${rel}`);
      if ((await sha256File(p)) !== sum) throw new Error(`The uploaded file ${rel} does not match its checksum in the manifest.`);
    }

    await client.connect();
    const { rows } = await client.query(`select count(*)::int as n from pg_tables where schemaname not in ('pg_catalog', 'information_schema')`);
    // Restoring over live data would mix two states; only an empty database is a safe target.
    if (rows[0].n > 0) throw new Error('The target database is not empty. Create an empty database and restore into that.');
    if ((await storage.list()).length > 0) {
      throw new Error(
        storage.kind === 's3'
          ? `The upload bucket ${storage.location} is not empty. Point S3_BUCKET (or S3_PREFIX) at an empty one.`
          : `The files folder ${storage.location} is not empty. Point FILES_DIR at an empty folder.`,
      );
    }

    await run(pgTool('pg_restore'), ['--no-owner', '--no-privileges', '--exit-on-error', '--single-transaction', `--dbname=${opts.databaseUrl}`, dumpFile]);
    for (const rel of Object.keys(manifest.files)) await storage.put(rel, readFileSync(join(work, 'files', rel)));

    const restored = await tableDigests(client);
    const differ = Object.keys({ ...manifest.tables, ...restored }).filter((t) => manifest.tables[t]?.rows !== restored[t]?.rows || manifest.tables[t]?.md5 !== restored[t]?.md5);
    if (differ.length) throw new Error(`After restoring, these tables differ from the backup: ${differ.join(', ')}`);
    return manifest;
  } finally {
    await client.end().catch(() => {});
    rmSync(work, { recursive: true, force: true });
  }
}
