// Pins what the official AWS SDK sends to the fake S3 server and what it reads back, for every
// call Beadpath's S3 storage makes: if the SDK changes its requests or the fake drifts from what
// the SDK parses, this fails before the upload tests quietly test nothing.
import { createHash } from 'node:crypto';
import { HeadObjectCommand, ListObjectsV2Command, NotFound, S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { loadStorageConfig, s3Settings } from '../../server/config/env';
import { s3Storage, storageFailure, type FileStorage } from '../../server/lib/storage';
import { startFakeS3, type FakeS3 } from '../fakes/s3';

let fake: FakeS3;
let storage: FileStorage;
let sdk: S3Client;

beforeAll(async () => {
  fake = await startFakeS3({ bucket: 'contract-bucket', accessKeyId: 'CONTRACTKEY' });
  const settings = s3Settings(loadStorageConfig({ ...fake.env, S3_PREFIX: 'plant-a' }))!;
  storage = s3Storage(settings);
  sdk = new S3Client({ region: 'eu-west-1', endpoint: fake.url, forcePathStyle: true, credentials: { accessKeyId: 'CONTRACTKEY', secretAccessKey: 'x' } });
});
afterAll(async () => fake?.close());
beforeEach(() => {
  fake.requests.length = 0;
  fake.failPuts = null;
});

const last = () => fake.requests[fake.requests.length - 1];

function expectSigned(h: Record<string, string>) {
  expect(h.authorization).toMatch(/^AWS4-HMAC-SHA256 Credential=CONTRACTKEY\/\d{8}\/eu-west-1\/s3\/aws4_request, SignedHeaders=[a-z0-9;-]*host[a-z0-9;-]*, Signature=[0-9a-f]{64}$/);
  expect(h['x-amz-date']).toMatch(/^\d{8}T\d{6}Z$/);
  expect(h['x-amz-content-sha256']).toBeTruthy();
  expect(h.host).toBe(new URL(fake.url).host);
}

describe('the fake S3 against the official SDK', () => {
  it('when a file is put, then the SDK sends a signed path-style PUT with the bytes under the prefix', async () => {
    const bytes = Buffer.from('seat photo bytes \u0000\u00ff', 'latin1');
    await storage.put('7/abc/display.webp', bytes);
    const r = last();
    expect(r).toMatchObject({ method: 'PUT', path: '/contract-bucket/plant-a/7/abc/display.webp' });
    expectSigned(r.headers);
    expect(r.body.equals(bytes)).toBe(true);
    // The payload is signed (its SHA-256 in the header) and carries the SDK's default CRC32 checksum.
    expect(r.headers['x-amz-content-sha256']).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(r.headers['x-amz-checksum-crc32']).toMatch(/^[A-Za-z0-9+/]{6}==$/);
    expect(Number(r.headers['content-length'] ?? r.headers['x-amz-decoded-content-length'])).toBe(bytes.length);
    expect(fake.objects.get('plant-a/7/abc/display.webp')?.data.equals(bytes)).toBe(true);
  });

  it('when a file is read back, then a signed GET returns the same bytes; a missing key reads as null (404 NoSuchKey)', async () => {
    const bytes = Buffer.from([1, 2, 3, 250, 251]);
    await storage.put('7/abc/thumb.webp', bytes);
    const got = await storage.get('7/abc/thumb.webp');
    expect(last()).toMatchObject({ method: 'GET', path: '/contract-bucket/plant-a/7/abc/thumb.webp' });
    expectSigned(last().headers);
    expect(got?.equals(bytes)).toBe(true);
    expect(await storage.get('7/nothing-here.webp')).toBeNull();
  });

  it('when an object is checked with HeadObject, then the SDK reads its size, and a missing one is NotFound', async () => {
    await storage.put('7/abc/large.webp', Buffer.alloc(1234, 7));
    const head = await sdk.send(new HeadObjectCommand({ Bucket: 'contract-bucket', Key: 'plant-a/7/abc/large.webp' }));
    expect(last()).toMatchObject({ method: 'HEAD', path: '/contract-bucket/plant-a/7/abc/large.webp' });
    expect(head.ContentLength).toBe(1234);
    expect(head.ETag).toMatch(/^"[0-9a-f]{32}"$/);
    await expect(sdk.send(new HeadObjectCommand({ Bucket: 'contract-bucket', Key: 'plant-a/none' }))).rejects.toBeInstanceOf(NotFound);
  });

  it('when a file is deleted, then a signed DELETE removes it, and deleting it again is not an error', async () => {
    await storage.put('7/gone/original.pdf', Buffer.from('%PDF-1.4'));
    await storage.delete('7/gone/original.pdf');
    expect(last()).toMatchObject({ method: 'DELETE', path: '/contract-bucket/plant-a/7/gone/original.pdf' });
    expectSigned(last().headers);
    expect(fake.objects.has('plant-a/7/gone/original.pdf')).toBe(false);
    await expect(storage.delete('7/gone/original.pdf')).resolves.toBeUndefined();
  });

  it('when keys are listed, then ListObjectsV2 pages through them with continuation tokens and the prefix is taken off', async () => {
    fake.objects.clear();
    for (const k of ['1/a/x.webp', '1/b/x.webp', '2/c/x.webp']) await storage.put(k, Buffer.from(k));
    fake.objects.set('other-app/z', { data: Buffer.from('z'), etag: '"0"', modified: new Date(), contentType: 'x' });
    fake.requests.length = 0;
    expect(await storage.list()).toEqual(['1/a/x.webp', '1/b/x.webp', '2/c/x.webp']);
    expect(last()).toMatchObject({ method: 'GET', path: '/contract-bucket/', query: { 'list-type': '2', prefix: 'plant-a/' } });
    const page1 = await sdk.send(new ListObjectsV2Command({ Bucket: 'contract-bucket', Prefix: 'plant-a/', MaxKeys: 2 }));
    expect(page1.Contents?.map((o) => o.Key)).toEqual(['plant-a/1/a/x.webp', 'plant-a/1/b/x.webp']);
    expect(page1.IsTruncated).toBe(true);
    const page2 = await sdk.send(new ListObjectsV2Command({ Bucket: 'contract-bucket', Prefix: 'plant-a/', MaxKeys: 2, ContinuationToken: page1.NextContinuationToken }));
    expect(last().query['continuation-token']).toBe(page1.NextContinuationToken);
    expect(page2.Contents?.map((o) => o.Key)).toEqual(['plant-a/2/c/x.webp']);
    expect(page2.IsTruncated).toBe(false);
  });

  it('when a request is not signed for the expected key, then the fake refuses it (so the checks above can fail)', async () => {
    const res = await fetch(`${fake.url}/contract-bucket/plant-a/1/a/x.webp`);
    expect(res.status).toBe(403);
    expect(await res.text()).toContain('<Code>InvalidAccessKeyId</Code>');
    const wrongKey = s3Storage({ ...s3Settings(loadStorageConfig(fake.env))!, accessKeyId: 'SOMEONEELSE' });
    await expect(wrongKey.get('1/a/x.webp')).rejects.toMatchObject({ name: 'InvalidAccessKeyId' });
  });

  it('when the store answers 507 or is down, then the SDK error is classed as "no space" or "refused"', async () => {
    fake.failPuts = { status: 507, code: 'InsufficientStorage' };
    const full = await storage.put('7/x.webp', Buffer.from('x')).catch((e: unknown) => e);
    expect(storageFailure(full)).toBe('no_space');
    fake.failPuts = { status: 503, code: 'SlowDown' };
    const slow = await storage.put('7/x.webp', Buffer.from('x')).catch((e: unknown) => e);
    expect(storageFailure(slow)).toBe('refused');
    fake.failPuts = null;
    await fake.stop();
    try {
      const started = Date.now();
      const down = await storage.put('7/x.webp', Buffer.from('x')).catch((e: unknown) => e);
      expect(down).toBeInstanceOf(Error);
      expect(storageFailure(down)).toBe('refused');
      expect(Date.now() - started, 'a stopped store fails fast').toBeLessThan(5000);
    } finally {
      await fake.start();
    }
  });
});

describe('S3 configuration', () => {
  it('when S3_BUCKET is set without credentials, or credentials without a bucket, then the config names each missing variable', () => {
    expect(() => loadStorageConfig({ S3_BUCKET: 'plant-files' })).toThrow(/S3_ACCESS_KEY_ID: required[\s\S]*S3_SECRET_ACCESS_KEY: required/);
    expect(() => loadStorageConfig({ S3_ACCESS_KEY_ID: 'k', S3_SECRET_ACCESS_KEY: 's' })).toThrow(/S3_BUCKET: required/);
    expect(() => loadStorageConfig({ ...fake.env, S3_BUCKET: 'Not_A_Bucket' })).toThrow(/S3_BUCKET: must be a bucket name/);
    expect(() => loadStorageConfig({ ...fake.env, S3_ENDPOINT: 'ftp://x' })).toThrow(/S3_ENDPOINT/);
    expect(() => loadStorageConfig({ ...fake.env, S3_PREFIX: '/abs/../x' })).toThrow(/S3_PREFIX/);
  });

  it('when no S3 variable is set, then uploads stay in the folder; with an endpoint, path style is on by default', () => {
    expect(s3Settings(loadStorageConfig({ FILES_DIR: '/tmp/x' }))).toBeNull();
    expect(s3Settings(loadStorageConfig({ S3_BUCKET: '', S3_ACCESS_KEY_ID: '' }))).toBeNull();
    expect(s3Settings(loadStorageConfig({ ...fake.env, S3_FORCE_PATH_STYLE: '' }))).toMatchObject({ forcePathStyle: true, prefix: '' });
    const aws = s3Settings(loadStorageConfig({ S3_BUCKET: 'plant-files', S3_ACCESS_KEY_ID: 'k', S3_SECRET_ACCESS_KEY: 's', S3_PREFIX: 'beadpath' }));
    expect(aws).toMatchObject({ region: 'us-east-1', forcePathStyle: false, prefix: 'beadpath/', endpoint: undefined });
  });
});
