// Backup and restore: a database with content and uploaded files goes into one archive and comes
// back into an empty database with every table's rows and every file's bytes the same; damage is refused.
import { createHash, randomBytes } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { execFileSync } from 'node:child_process';
import pg from 'pg';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { backup, restore, tableDigests } from '../../scripts/lib/backup';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
const work = mkdtempSync(join(tmpdir(), 'beadpath-backup-test-'));
const archive = join(work, 'beadpath.tar.gz');
const created: string[] = [];

async function admin(sql: string) {
  const c = new pg.Client({ connectionString: inject('pgAdminUrl') });
  await c.connect();
  try {
    await c.query(sql);
  } finally {
    await c.end();
  }
}

async function emptyDatabase(): Promise<string> {
  const name = `r_${randomBytes(5).toString('hex')}`;
  await admin(`create database "${name}"`);
  created.push(name);
  return inject('pgUrlPrefix') + name;
}

async function digestsOf(url: string) {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    return await tableDigests(c);
  } finally {
    await c.end();
  }
}

function fileSums(root: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out[relative(root, p)] = createHash('sha256').update(readFileSync(p)).digest('hex');
    }
  };
  if (existsSync(root)) walk(root);
  return out;
}

beforeAll(async () => {
  t = await startTestApp();
  const { agent } = await t.signIn(['admin', 'author', 'technician']);
  await agent.post('/api/sites').send({ name: 'Backup works' }).expect(201);
  const body = { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Keep the seat clean — ünïcode and "quotes".' }] }] };
  await agent.post('/api/articles').send({ title: 'Backed-up article', body }).expect(201);
  const png = await sharp({ create: { width: 30, height: 20, channels: 3, background: { r: 40, g: 90, b: 10 } } })
    .png()
    .toBuffer();
  await agent.post('/api/files').attach('file', png, 'seat.png').expect(201);
  await agent.patch('/api/admin/settings').send({ allowSelfPublish: true }).expect(200);
}, 60_000);
afterAll(async () => {
  await t?.close();
  for (const name of created) await admin(`drop database if exists "${name}" with (force)`);
  rmSync(work, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('when a database with rows and files is backed up and restored into an empty database, then every table and file is the same', async () => {
    const manifest = await backup({ databaseUrl: t.dbUrl, filesDir: t.app.locals.filesDir, out: archive });
    expect(existsSync(`${archive}.sha256`)).toBe(true);
    expect(manifest.tables.sites.rows).toBe(1);
    expect(manifest.tables.audit_events.rows).toBeGreaterThan(0);
    expect(Object.keys(manifest.files).length).toBe(3);

    const target = await emptyDatabase();
    const filesDir = join(work, 'restored-files');
    await restore({ file: archive, databaseUrl: target, filesDir });

    const after = await digestsOf(target);
    expect(Object.keys(after).length).toBeGreaterThan(20);
    // Compared with the backup's own snapshot: the live database keeps moving (sessions, queues).
    expect(after).toEqual(manifest.tables);
    // And with the live database, counted independently, except the search indexer's own bookkeeping that runs in the background.
    const live = await digestsOf(t.dbUrl);
    const stable = (d: typeof live) => Object.fromEntries(Object.entries(d).filter(([k]) => !k.startsWith('search_')));
    expect(stable(after)).toEqual(stable(live));
    expect(after.sites.rows).toBe(1);
    expect(fileSums(filesDir)).toEqual(fileSums(t.app.locals.filesDir));
    // The restored schema still refuses audit edits: triggers and functions came back too.
    const c = new pg.Client({ connectionString: target });
    await c.connect();
    await expect(c.query('delete from audit_events')).rejects.toThrow(/append-only/);
    await c.end();
  }, 30_000);

  it('when the target database is not empty, then restore refuses and leaves it as it was', async () => {
    const before = await digestsOf(t.dbUrl);
    await expect(restore({ file: archive, databaseUrl: t.dbUrl, filesDir: join(work, 'other-files') })).rejects.toThrow(/not empty/);
    expect(await digestsOf(t.dbUrl)).toEqual(before);
  });

  it('when a file inside the archive was changed, then restore refuses before touching the database', async () => {
    const unpacked = join(work, 'unpacked');
    execFileSync('mkdir', ['-p', unpacked]);
    execFileSync('tar', ['-xzf', archive, '-C', unpacked]);
    const manifest = JSON.parse(readFileSync(join(unpacked, 'manifest.json'), 'utf8'));
    const victim = join(unpacked, 'files', Object.keys(manifest.files)[0]);
    writeFileSync(victim, Buffer.concat([readFileSync(victim), Buffer.from('x')]));
    const tampered = join(work, 'tampered.tar.gz');
    execFileSync('tar', ['-czf', tampered, '-C', unpacked, '.']);
    const target = await emptyDatabase();
    await expect(restore({ file: tampered, databaseUrl: target, filesDir: join(work, 'tampered-files') })).rejects.toThrow(/does not match its checksum/);
    expect(Object.keys(await digestsOf(target))).toEqual([]);
  });

  it('when the archive itself no longer matches its checksum file, then restore refuses', async () => {
    const copy = join(work, 'copy.tar.gz');
    writeFileSync(copy, Buffer.concat([readFileSync(archive), Buffer.from([0])]));
    writeFileSync(`${copy}.sha256`, readFileSync(`${archive}.sha256`));
    await expect(restore({ file: copy, databaseUrl: await emptyDatabase(), filesDir: join(work, 'copy-files') })).rejects.toThrow(/checksum/);
  });
});
