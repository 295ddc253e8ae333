// Uploads with S3-compatible object storage: the app configured only through S3_* variables
// stores every size of a photo in the bucket, reads them back, removes what a half-finished upload
// wrote, and answers a clear 503 naming the storage (with no row left) while the bucket is down.
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import sharp from 'sharp';
import { afterAll, beforeAll, beforeEach, describe, expect, inject, it } from 'vitest';
import { loadStorageConfig, s3Settings } from '../../server/config/env';
import { s3Storage } from '../../server/lib/storage';
import { backup, restore, tableDigests } from '../../scripts/lib/backup';
import { startFakeS3, type FakeS3 } from '../fakes/s3';
import { startTestApp, type TestApp } from '../helpers/test-app';

let fake: FakeS3;
let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let tech: Agent;

beforeAll(async () => {
  fake = await startFakeS3({ bucket: 'plant-uploads' });
  t = await startTestApp({ ...fake.env, S3_PREFIX: 'beadpath' });
  tech = (await t.signIn(['technician'])).agent;
});
afterAll(async () => {
  await t?.close();
  await fake?.close();
});
beforeEach(async () => {
  fake.failPuts = null;
  await fake.start();
});

const binary = (r: import('supertest').Response, cb: (err: Error | null, body: Buffer) => void) => {
  const stream = r as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => cb(null, Buffer.concat(chunks)));
};

const photo = () =>
  sharp({ create: { width: 1600, height: 900, channels: 3, background: { r: 90, g: 140, b: 200 } } })
    .jpeg()
    .toBuffer();
const fileRows = async () => Number((await t.db('files').count<{ count: string }[]>('* as count'))[0].count);

describe('uploads in S3-compatible storage', () => {
  it('when S3_BUCKET and credentials are set, then the app stores uploads in the bucket and not in the folder', () => {
    expect(t.app.locals.storage.kind).toBe('s3');
    expect(t.app.locals.storage.location).toBe('s3://plant-uploads/beadpath/');
  });

  it('when a photo is uploaded, then its three sizes are objects in the bucket and each reads back byte for byte', async () => {
    const res = await tech.post('/api/files').attach('file', await photo(), 'nozzle.jpg');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const id = res.body.file.id as string;
    const keys = [...fake.objects.keys()].filter((k) => k.includes(id)).sort();
    expect(keys).toEqual(['display', 'large', 'thumb'].map((v) => `beadpath/${t.organisationId}/${id}/${v}.webp`));
    for (const variant of ['large', 'display', 'thumb']) {
      const got = await tech.get(`/api/files/${id}/${variant}`).buffer(true).parse(binary);
      expect(got.status).toBe(200);
      expect(got.headers['content-type']).toBe('image/webp');
      const stored = fake.objects.get(`beadpath/${t.organisationId}/${id}/${variant}.webp`)!.data;
      expect((got.body as Buffer).equals(stored), variant).toBe(true);
      const meta = await sharp(got.body as Buffer).metadata();
      expect(meta.width).toBe(Math.min(1600, { large: 2400, display: 1400, thumb: 360 }[variant]!));
    }
    const gets = fake.requests.filter((r) => r.method === 'GET' && r.path.includes(id));
    expect(gets).toHaveLength(3);
  });

  it('when a PDF is uploaded, then the original is one object and reads back the same', async () => {
    const pdf = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj 2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');
    const res = await tech.post('/api/files').attach('file', pdf, 'data sheet.pdf');
    expect(res.status).toBe(201);
    const got = await tech.get(res.body.file.urls.original).buffer(true).parse(binary);
    expect((got.body as Buffer).equals(pdf)).toBe(true);
  });

  it('when the bucket refuses one size half-way through, then the sizes already written are deleted, no row is left, and the answer is 503 naming the storage', async () => {
    const before = { rows: await fileRows(), objects: fake.objects.size };
    fake.requests.length = 0;
    fake.failPuts = { status: 500, code: 'InternalError', match: /\/thumb\.webp$/ };
    const res = await tech.post('/api/files').attach('file', await photo(), 'half.jpg');
    expect(res.status).toBe(503);
    expect(res.body.error).toMatchObject({ code: 'unavailable', message: expect.stringMatching(/could not be stored.*object storage.*Nothing was saved/) });
    expect(await fileRows()).toBe(before.rows);
    expect(fake.objects.size).toBe(before.objects);
    const deleted = fake.requests
      .filter((r) => r.method === 'DELETE')
      .map((r) => r.path.split('/').pop())
      .sort();
    // The refused size is deleted too: a store may keep part of what it refused.
    expect(deleted).toEqual(['display.webp', 'large.webp', 'thumb.webp']);
  });

  it('when the bucket says it is full, then the upload answers 507 saying the storage is full and nothing was saved', async () => {
    const rows = await fileRows();
    fake.failPuts = { status: 507, code: 'InsufficientStorage' };
    const res = await tech.post('/api/files').attach('file', await photo(), 'full.jpg');
    expect(res.status).toBe(507);
    expect(res.body.error).toMatchObject({ code: 'insufficient_storage', message: expect.stringMatching(/could not be stored.*full.*Nothing was saved/), fields: { file: expect.any(String) } });
    expect(await fileRows()).toBe(rows);
  });

  it('when the storage server is stopped, then uploads and reads answer 503 naming the storage at once, no row is left, and both work again when it is back', async () => {
    const stored = await tech.post('/api/files').attach('file', await photo(), 'before.jpg');
    expect(stored.status).toBe(201);
    const rows = await fileRows();
    await fake.stop();

    const started = Date.now();
    const up = await tech.post('/api/files').attach('file', await photo(), 'while-down.jpg');
    expect(up.status).toBe(503);
    expect(up.body.error).toMatchObject({
      code: 'unavailable',
      message: expect.stringMatching(/could not be stored: the object storage refused the write or is not reachable/),
      requestId: expect.any(String),
    });
    expect(Date.now() - started).toBeLessThan(8000);
    expect(await fileRows()).toBe(rows);

    const read = await tech.get(stored.body.file.urls.display);
    expect(read.status).toBe(503);
    expect(read.body.error).toMatchObject({ code: 'unavailable', message: expect.stringMatching(/file storage is not reachable/) });

    await fake.start();
    expect((await tech.get(stored.body.file.urls.display)).status).toBe(200);
    expect((await tech.post('/api/files').attach('file', await photo(), 'after.jpg')).status).toBe(201);
    expect(await fileRows()).toBe(rows + 1);
  });
});

describe('backup and restore with S3 storage', () => {
  const work = mkdtempSync(join(tmpdir(), 'beadpath-s3-backup-'));
  const databases: string[] = [];
  async function admin(sql: string) {
    const c = new pg.Client({ connectionString: inject('pgAdminUrl') });
    await c.connect();
    try {
      await c.query(sql);
    } finally {
      await c.end();
    }
  }
  async function digests(url: string) {
    const c = new pg.Client({ connectionString: url });
    await c.connect();
    try {
      return await tableDigests(c);
    } finally {
      await c.end();
    }
  }
  afterAll(async () => {
    rmSync(work, { recursive: true, force: true });
    for (const d of databases) await admin(`drop database if exists "${d}" with (force)`);
  });

  it('when the uploads live in a bucket, then backup takes every object through the SDK and restore puts them into an empty prefix with the same bytes; a non-empty one is refused', async () => {
    const up = await tech.post('/api/files').attach('file', await photo(), 'backed-up.jpg');
    expect(up.status).toBe(201);
    const archive = join(work, 'with-s3.tar.gz');
    const manifest = await backup({ databaseUrl: t.dbUrl, storage: t.app.locals.storage, out: archive });
    const inBucket = [...fake.objects.keys()]
      .filter((k) => k.startsWith('beadpath/'))
      .map((k) => k.slice('beadpath/'.length))
      .sort();
    expect(Object.keys(manifest.files).sort()).toEqual(inBucket);
    expect(inBucket).toContain(`${t.organisationId}/${up.body.file.id}/display.webp`);

    const name = `r_${randomBytes(5).toString('hex')}`;
    await admin(`create database "${name}"`);
    databases.push(name);
    const target = inject('pgUrlPrefix') + name;
    const restoredInto = s3Storage(s3Settings(loadStorageConfig({ ...fake.env, S3_PREFIX: 'restored' }))!);
    await restore({ file: archive, databaseUrl: target, storage: restoredInto });
    for (const k of inBucket) expect(fake.objects.get(`restored/${k}`)?.data.equals(fake.objects.get(`beadpath/${k}`)!.data), k).toBe(true);
    expect(await digests(target)).toEqual(manifest.tables);

    const again = `r_${randomBytes(5).toString('hex')}`;
    await admin(`create database "${again}"`);
    databases.push(again);
    await expect(restore({ file: archive, databaseUrl: inject('pgUrlPrefix') + again, storage: restoredInto })).rejects.toThrow(/upload bucket s3:\/\/plant-uploads\/restored\/ is not empty/);
  }, 60_000);
});
