// Uploads: the real type from the bytes, photos upright and stripped of metadata, limits, and
// nothing left behind when a file is refused.
import { readdirSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
let filesDir: string;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let tech: Agent;

beforeAll(async () => {
  t = await startTestApp();
  filesDir = (t.app.locals as unknown as { filesDir: string }).filesDir;
  tech = (await t.signIn(['technician'])).agent;
});
afterAll(async () => t?.close());

function countStored(): number {
  if (!existsSync(filesDir)) return 0;
  let n = 0;
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) e.isDirectory() ? walk(join(d, e.name)) : n++;
  };
  walk(filesDir);
  return n;
}

/** A 60 x 30 JPEG that says "rotate 90 degrees" in EXIF and carries a GPS position, as phones write. */
async function phonePhoto(): Promise<Buffer> {
  return sharp({ create: { width: 60, height: 30, channels: 3, background: { r: 200, g: 120, b: 0 } } })
    .jpeg()
    .withMetadata({ orientation: 6 })
    .withExifMerge({ IFD0: { Make: 'Example phone' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' } })
    .toBuffer();
}

const minimalPdf = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj 2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');

describe('uploads', () => {
  it('when a phone photo with EXIF orientation and GPS is uploaded, then it is stored upright with no metadata in three sizes', async () => {
    const input = await phonePhoto();
    const inMeta = await sharp(input).metadata();
    expect(inMeta.orientation).toBe(6);
    // The GPS IFD pointer (tag 0x8825, little-endian) is in the input's EXIF block.
    expect(inMeta.exif!.includes(Buffer.from([0x25, 0x88]))).toBe(true);
    const res = await tech.post('/api/files').attach('file', input, 'seat-closeup.jpg');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.file).toMatchObject({ kind: 'photo', width: 30, height: 60 });
    for (const variant of ['large', 'display', 'thumb']) {
      const got = await tech
        .get(res.body.file.urls[variant])
        .buffer(true)
        .parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        });
      expect(got.status).toBe(200);
      expect(got.headers['content-type']).toBe('image/webp');
      expect(got.headers['cache-control']).toMatch(/max-age=31536000/);
      const meta = await sharp(got.body as Buffer).metadata();
      expect(meta.exif, variant).toBeUndefined();
      expect(meta.orientation).toBeUndefined();
      expect(meta.height! > meta.width!, 'portrait after applying orientation').toBe(true);
    }
  });

  it('when PNG, WebP and PDF files are uploaded, then they are accepted by their bytes', async () => {
    const png = await sharp({ create: { width: 8, height: 8, channels: 4, background: '#ffffff' } })
      .png()
      .toBuffer();
    const webp = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#000000' } })
      .webp()
      .toBuffer();
    expect((await tech.post('/api/files').attach('file', png, 'diagram.png')).body.file.kind).toBe('photo');
    expect((await tech.post('/api/files').attach('file', webp, 'x.webp')).body.file.kind).toBe('photo');
    const pdf = await tech.post('/api/files').attach('file', minimalPdf, 'safety data sheet.pdf');
    expect(pdf.status).toBe(201);
    expect(pdf.body.file).toMatchObject({ kind: 'document', mime: 'application/pdf' });
    const got = await tech.get(pdf.body.file.urls.original);
    expect(got.headers['content-type']).toBe('application/pdf');
  });

  it('when a file is of another type, lies about its type, is corrupt or too large, then a clear message and nothing is stored', async () => {
    const rowsBefore = Number((await t.db('files').count('* as c').first())!.c);
    const storedBefore = countStored();
    const gif = Buffer.from('R0lGODlhAQABAIAAAAAAAP///yH5BAEAAAAALAAAAAABAAEAAAIBRAA7', 'base64');
    const g = await tech.post('/api/files').attach('file', gif, 'anim.gif');
    expect(g.status).toBe(415);
    expect(g.body.error.message).toMatch(/JPEG, PNG or WebP photos and PDF/);
    const text = await tech.post('/api/files').attach('file', Buffer.from('#!/bin/sh\necho hi\n'), 'script.sh');
    expect(text.status).toBe(415);
    expect(text.body.error.message).toMatch(/Accepted: JPEG, PNG or WebP photos and PDF documents/);
    const liar = await tech.post('/api/files').attach('file', minimalPdf, 'holiday.jpg');
    expect(liar.status).toBe(400);
    expect(liar.body.error.message).toMatch(/named \.jpg but its contents are PDF/);
    const jpegHeader = (await phonePhoto()).subarray(0, 200);
    const corrupt = await tech.post('/api/files').attach('file', Buffer.concat([jpegHeader, Buffer.alloc(500, 7)]), 'broken.jpg');
    expect(corrupt.status).toBe(400);
    expect(corrupt.body.error.message).toMatch(/could not be read/);
    const huge = await tech.post('/api/files').attach('file', Buffer.alloc(50 * 1024 * 1024, 1), 'huge.pdf');
    expect(huge.status).toBe(413);
    expect(huge.body.error.message).toMatch(/larger than 15 MB/);
    const none = await tech.post('/api/files').field('nothing', 'here');
    expect(none.status).toBe(400);
    expect(Number((await t.db('files').count('* as c').first())!.c)).toBe(rowsBefore);
    expect(countStored()).toBe(storedBefore);
  });

  it('when someone not signed in or from another organisation asks for a file, then it is not served', async () => {
    const png = await sharp({ create: { width: 4, height: 4, channels: 3, background: '#336699' } })
      .png()
      .toBuffer();
    const up = (await tech.post('/api/files').attach('file', png, 'p.png')).body.file;
    expect((await t.agent().get(up.urls.display)).status).toBe(401);
    const other = await startTestApp();
    try {
      const { agent } = await other.signIn(['technician']);
      expect((await agent.get(up.urls.display)).status).toBe(404);
    } finally {
      await other.close();
    }
  });
});
