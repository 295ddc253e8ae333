// Where uploaded bytes live: a local folder by default, or an S3-compatible bucket (through the
// official AWS SDK) when S3_BUCKET and its credentials are set. Every read and write of upload
// bytes in the app, the demo seed and backup/restore goes through a FileStorage from here.
import { mkdir, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, NoSuchKey, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import { s3Settings, type S3Settings, type StorageConfig } from '../config/env';

export interface FileStorage {
  /** "folder" for the local disk, "s3" for a bucket; said in logs and error messages. */
  readonly kind: 'folder' | 's3';
  /** Where, for people: the folder path or s3://bucket/prefix. */
  readonly location: string;
  put(key: string, data: Buffer): Promise<void>;
  get(key: string): Promise<Buffer | null>;
  delete(key: string): Promise<void>;
  /** Every stored key, sorted (backup walks them). */
  list(): Promise<string[]>;
}

/**
 * Why a write was refused, in the words the API answers with: no space left, or the storage
 * refusing or unreachable. Anything else is treated as "refused" too: the bytes are not there.
 */
export function storageFailure(err: unknown): 'no_space' | 'refused' {
  const e = err as { code?: string; name?: string; Code?: string; $metadata?: { httpStatusCode?: number } };
  if (e?.code === 'ENOSPC' || e?.code === 'EDQUOT') return 'no_space';
  // S3-compatible services answer a full disk with 507 or EntityTooLarge/QuotaExceeded-like codes.
  if (e?.$metadata?.httpStatusCode === 507 || /^(InsufficientStorage|XMinioStorageFull|QuotaExceeded)$/.test(e?.name ?? e?.Code ?? '')) return 'no_space';
  return 'refused';
}

export function localStorage(root: string): FileStorage {
  const base = resolve(root);
  const pathOf = (key: string) => {
    const p = resolve(join(base, key));
    if (!p.startsWith(base + sep)) throw new Error(`storage key escapes the folder: ${key}`);
    return p;
  };
  return {
    kind: 'folder',
    location: base,
    async put(key, data) {
      const p = pathOf(key);
      try {
        await mkdir(dirname(p), { recursive: true });
        await writeFile(p, data);
      } catch (err) {
        // A full or read-only disk can leave a truncated file behind: it must not look stored.
        await rm(p, { force: true }).catch(() => {});
        throw err;
      }
    },
    async get(key) {
      try {
        return await readFile(pathOf(key));
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
    },
    async delete(key) {
      await rm(pathOf(key), { force: true });
    },
    async list() {
      const out: string[] = [];
      const walk = async (d: string) => {
        let entries;
        try {
          entries = await readdir(d, { withFileTypes: true });
        } catch (err) {
          if ((err as NodeJS.ErrnoException).code === 'ENOENT') return;
          throw err;
        }
        for (const e of entries) {
          const p = join(d, e.name);
          if (e.isDirectory()) await walk(p);
          else if (e.isFile()) out.push(relative(base, p).split(sep).join('/'));
        }
      };
      await walk(base);
      return out.sort();
    },
  };
}

/** An S3-compatible bucket. Keys are the same as in the folder, under the optional prefix. */
export function s3Storage(s: S3Settings, opts: { client?: S3Client } = {}): FileStorage {
  const client =
    opts.client ??
    new S3Client({
      region: s.region,
      endpoint: s.endpoint,
      forcePathStyle: s.forcePathStyle,
      credentials: { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey },
      // A storage that is down must fail an upload in seconds, not hang the request.
      maxAttempts: 2,
      requestHandler: { connectionTimeout: 3000, requestTimeout: 20_000 },
    });
  const keyOf = (key: string) => {
    if (key.startsWith('/') || key.split('/').some((part) => part === '..' || part === '.' || part === '')) throw new Error(`storage key is not a plain path: ${key}`);
    return s.prefix + key;
  };
  return {
    kind: 's3',
    location: `s3://${s.bucket}/${s.prefix}`,
    async put(key, data) {
      await client.send(new PutObjectCommand({ Bucket: s.bucket, Key: keyOf(key), Body: data, ContentLength: data.length }));
    },
    async get(key) {
      try {
        const out = await client.send(new GetObjectCommand({ Bucket: s.bucket, Key: keyOf(key) }));
        if (!out.Body) return null;
        return Buffer.from(await out.Body.transformToByteArray());
      } catch (err) {
        if (err instanceof NoSuchKey || (err instanceof S3ServiceException && err.$metadata.httpStatusCode === 404)) return null;
        throw err;
      }
    },
    async delete(key) {
      // S3 answers 204 for a key that is not there, like rm --force.
      await client.send(new DeleteObjectCommand({ Bucket: s.bucket, Key: keyOf(key) }));
    },
    async list() {
      const out: string[] = [];
      let token: string | undefined;
      do {
        const page = await client.send(new ListObjectsV2Command({ Bucket: s.bucket, Prefix: s.prefix || undefined, ContinuationToken: token }));
        for (const o of page.Contents ?? []) if (o.Key) out.push(o.Key.slice(s.prefix.length));
        token = page.IsTruncated ? page.NextContinuationToken : undefined;
      } while (token);
      return out.sort();
    },
  };
}

/** The storage the configuration names: S3 when S3_BUCKET and credentials are set, else the folder. */
export function storageFor(config: StorageConfig, defaultDir: string): FileStorage {
  const s3 = s3Settings(config);
  return s3 ? s3Storage(s3) : localStorage(config.FILES_DIR ?? defaultDir);
}
