// A local stand-in for an S3-compatible object store: the subset of the S3 REST API the official
// AWS SDK sends for Beadpath's uploads (PutObject, GetObject, HeadObject, DeleteObject,
// ListObjectsV2), path-style, kept in memory. Signatures are not verified, but every request must
// carry SigV4 headers for the expected access key. Tests can stop and restart it, make writes
// fail, and read what it was sent. Pinned by tests/api/storage-s3-contract.test.ts.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo, Socket } from 'node:net';
import { createHash } from 'node:crypto';

export interface S3RecordedRequest {
  method: string;
  /** Path without the query, decoded: /bucket/key. */
  path: string;
  query: Record<string, string>;
  headers: Record<string, string>;
  /** The object bytes after undoing aws-chunked framing, for PUT. */
  body: Buffer;
}

interface StoredObject {
  data: Buffer;
  etag: string;
  modified: Date;
  contentType: string;
}

export interface FakeS3 {
  /** http://127.0.0.1:port, for S3_ENDPOINT. */
  url: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  requests: S3RecordedRequest[];
  objects: Map<string, StoredObject>;
  /** The env vars that point Beadpath at this fake. */
  env: Record<string, string>;
  /** Every PUT (or those whose key matches) answers with this S3 error until cleared (null). */
  failPuts: { status: number; code: string; match?: RegExp } | null;
  stop(): Promise<void>;
  start(): Promise<void>;
  close(): Promise<void>;
}

const xmlEscape = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

function errorXml(res: ServerResponse, status: number, code: string, message: string, resource = '') {
  res.writeHead(status, { 'content-type': 'application/xml', 'x-amz-request-id': 'fake' });
  res.end(`<?xml version="1.0" encoding="UTF-8"?>\n<Error><Code>${code}</Code><Message>${xmlEscape(message)}</Message><Resource>${xmlEscape(resource)}</Resource><RequestId>fake</RequestId></Error>`);
}

/** Undoes the aws-chunked framing the SDK uses for streamed bodies with trailing checksums. */
export function decodeAwsChunked(raw: Buffer): Buffer {
  const parts: Buffer[] = [];
  let at = 0;
  for (;;) {
    const eol = raw.indexOf('\r\n', at);
    if (eol < 0) throw new Error('aws-chunked body ends without a final chunk');
    const size = parseInt(raw.subarray(at, eol).toString('latin1').split(';')[0], 16);
    if (!Number.isFinite(size)) throw new Error('aws-chunked body has a bad chunk size');
    at = eol + 2;
    if (size === 0) break;
    parts.push(raw.subarray(at, at + size));
    at += size + 2;
  }
  return Buffer.concat(parts);
}

export async function startFakeS3(opts: { bucket?: string; accessKeyId?: string; secretAccessKey?: string; port?: number } = {}): Promise<FakeS3> {
  const bucket = opts.bucket ?? 'beadpath-test';
  const accessKeyId = opts.accessKeyId ?? 'FAKEACCESSKEY';
  const secretAccessKey = opts.secretAccessKey ?? 'fake-secret-key-not-checked';
  const objects = new Map<string, StoredObject>();
  const requests: S3RecordedRequest[] = [];
  const sockets = new Set<Socket>();
  let server: Server | null = null;
  let port = opts.port ?? 0;

  const fake: FakeS3 = {
    url: '',
    bucket,
    accessKeyId,
    secretAccessKey,
    requests,
    objects,
    env: {},
    failPuts: null,
    async stop() {
      if (!server) return;
      const s = server;
      server = null;
      for (const sock of sockets) sock.destroy();
      await new Promise<void>((r) => s.close(() => r()));
    },
    async start() {
      if (server) return;
      const s = createServer((req, res) => void handle(req, res));
      s.on('connection', (sock) => {
        sockets.add(sock);
        sock.on('close', () => sockets.delete(sock));
      });
      await new Promise<void>((r) => s.listen(port, '127.0.0.1', () => r()));
      port = (s.address() as AddressInfo).port;
      server = s;
    },
    async close() {
      await fake.stop();
    },
  };

  async function handle(req: IncomingMessage, res: ServerResponse) {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    let body: Buffer = Buffer.concat(chunks);
    const u = new URL(req.url ?? '/', 'http://fake');
    const headers = Object.fromEntries(Object.entries(req.headers).map(([k, v]) => [k, Array.isArray(v) ? v.join(',') : String(v)]));
    if ((headers['content-encoding'] ?? '').includes('aws-chunked') || (headers['x-amz-content-sha256'] ?? '').startsWith('STREAMING-')) {
      try {
        body = decodeAwsChunked(body);
      } catch (err) {
        return errorXml(res, 400, 'IncompleteBody', (err as Error).message);
      }
    }
    const path = decodeURIComponent(u.pathname);
    requests.push({ method: req.method ?? '', path, query: Object.fromEntries(u.searchParams), headers, body });

    // SigV4 is not verified, but it must be there and name our key.
    const auth = headers.authorization ?? '';
    if (!auth.startsWith(`AWS4-HMAC-SHA256 Credential=${accessKeyId}/`) || !/SignedHeaders=[^,]*host/.test(auth) || !/Signature=[0-9a-f]{64}/.test(auth)) {
      return errorXml(res, 403, 'InvalidAccessKeyId', 'The request is not signed with SigV4 for the expected access key', path);
    }
    if (!headers['x-amz-date'] || !headers['x-amz-content-sha256']) return errorXml(res, 403, 'AccessDenied', 'x-amz-date and x-amz-content-sha256 are required', path);

    // A signed payload hash must match the bytes, as S3 checks it.
    const payloadHash = headers['x-amz-content-sha256'];
    if (/^[0-9a-f]{64}$/.test(payloadHash) && createHash('sha256').update(body).digest('hex') !== payloadHash) {
      return errorXml(res, 400, 'XAmzContentSHA256Mismatch', 'The provided x-amz-content-sha256 header does not match what was computed.', path);
    }

    const [, b, ...rest] = path.split('/');
    const key = rest.join('/');
    if (b !== bucket) return errorXml(res, 404, 'NoSuchBucket', 'The specified bucket does not exist', `/${b}`);

    if (!key) {
      if (req.method === 'GET' && u.searchParams.get('list-type') === '2') return list(u, res);
      return errorXml(res, 501, 'NotImplemented', `The fake does not implement ${req.method} on a bucket`);
    }
    const found = objects.get(key);
    switch (req.method) {
      case 'PUT': {
        if (fake.failPuts && (!fake.failPuts.match || fake.failPuts.match.test(key))) return errorXml(res, fake.failPuts.status, fake.failPuts.code, 'Writes are refused by the test', path);
        if (headers['content-length'] === undefined && headers['x-amz-decoded-content-length'] === undefined) return errorXml(res, 411, 'MissingContentLength', 'Content-Length is required');
        const etag = `"${createHash('md5').update(body).digest('hex')}"`;
        objects.set(key, { data: body, etag, modified: new Date(), contentType: headers['content-type'] ?? 'application/octet-stream' });
        res.writeHead(200, { etag, 'x-amz-request-id': 'fake' });
        return res.end();
      }
      case 'GET':
      case 'HEAD': {
        if (!found) {
          if (req.method === 'HEAD') {
            res.writeHead(404);
            return res.end();
          }
          return errorXml(res, 404, 'NoSuchKey', 'The specified key does not exist.', path);
        }
        res.writeHead(200, {
          'content-type': found.contentType,
          'content-length': String(found.data.length),
          etag: found.etag,
          'last-modified': found.modified.toUTCString(),
          'accept-ranges': 'bytes',
        });
        return res.end(req.method === 'HEAD' ? undefined : found.data);
      }
      case 'DELETE':
        objects.delete(key);
        res.writeHead(204);
        return res.end();
      default:
        return errorXml(res, 405, 'MethodNotAllowed', `${req.method} is not allowed`);
    }
  }

  function list(u: URL, res: ServerResponse) {
    const prefix = u.searchParams.get('prefix') ?? '';
    const max = Math.min(Number(u.searchParams.get('max-keys') ?? 1000) || 1000, 1000);
    const after = u.searchParams.get('continuation-token') ?? u.searchParams.get('start-after') ?? '';
    const keys = [...objects.keys()].filter((k) => k.startsWith(prefix) && k > after).sort();
    const page = keys.slice(0, max);
    const truncated = keys.length > max;
    const contents = page
      .map((k) => {
        const o = objects.get(k)!;
        return `<Contents><Key>${xmlEscape(k)}</Key><LastModified>${o.modified.toISOString()}</LastModified><ETag>${xmlEscape(o.etag)}</ETag><Size>${o.data.length}</Size><StorageClass>STANDARD</StorageClass></Contents>`;
      })
      .join('');
    res.writeHead(200, { 'content-type': 'application/xml' });
    res.end(
      `<?xml version="1.0" encoding="UTF-8"?>\n<ListBucketResult xmlns="http://s3.amazonaws.com/doc/2006-03-01/"><Name>${bucket}</Name><Prefix>${xmlEscape(prefix)}</Prefix><KeyCount>${page.length}</KeyCount><MaxKeys>${max}</MaxKeys><IsTruncated>${truncated}</IsTruncated>${
        truncated ? `<NextContinuationToken>${xmlEscape(page[page.length - 1])}</NextContinuationToken>` : ''
      }${contents}</ListBucketResult>`,
    );
  }

  await fake.start();
  fake.url = `http://127.0.0.1:${port}`;
  fake.env = {
    S3_BUCKET: bucket,
    S3_REGION: 'eu-west-1',
    S3_ENDPOINT: fake.url,
    S3_ACCESS_KEY_ID: accessKeyId,
    S3_SECRET_ACCESS_KEY: secretAccessKey,
    S3_FORCE_PATH_STYLE: '1',
  };
  return fake;
}

/** Runs the fake on its own for trying Beadpath with S3 by hand: `npx tsx tests/fakes/s3.ts [port]`. */
if (import.meta.url === `file://${process.argv[1]}`) {
  const fake = await startFakeS3({ port: Number(process.argv[2] ?? 9000) });
  console.log(
    `fake S3 listening on ${fake.url}; start Beadpath with:\n${Object.entries(fake.env)
      .map(([k, v]) => `  ${k}=${v}`)
      .join(' \\\n')} \\\n  npm start`,
  );
}
