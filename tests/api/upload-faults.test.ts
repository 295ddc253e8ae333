// The disk refusing a write: when storing an upload's bytes fails (no space, no permission, a
// read-only disk), every route that stores bytes answers a clear 507/503 in the one error shape,
// leaves no row pointing at missing bytes, and removes whatever part of the bytes was written.
import { randomUUID } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { localStorage, type FileStorage } from '../../server/lib/storage';
import { startTestApp, type TestApp } from '../helpers/test-app';

type Fault = 'ENOSPC' | 'EACCES' | 'EROFS' | 'EIO';

/** The real folder storage, except that while a fault is set, writes put half the bytes on disk and then fail as the system would. */
function faultyStorage(dir: string) {
  const inner = localStorage(dir);
  const state = { fault: null as Fault | null, putsBeforeFault: 0, puts: [] as string[] };
  const storage: FileStorage = {
    ...inner,
    async put(key, data) {
      state.puts.push(key);
      if (state.fault && state.puts.length > state.putsBeforeFault) {
        // What a full disk does: part of the file lands before the write fails.
        await inner.put(key, data.subarray(0, Math.floor(data.length / 2)));
        const err = new Error(`${state.fault}: simulated, write '${key}'`) as NodeJS.ErrnoException;
        err.code = state.fault;
        err.errno = { ENOSPC: -28, EACCES: -13, EROFS: -30, EIO: -5 }[state.fault];
        err.syscall = 'write';
        throw err;
      }
      return inner.put(key, data);
    },
  };
  return { storage, state, inner };
}

let t: TestApp;
let faulty: ReturnType<typeof faultyStorage>;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let everyone: Agent;

beforeAll(async () => {
  faulty = faultyStorage(mkdtempSync(join(tmpdir(), 'beadpath-faulty-')));
  t = await startTestApp({}, { storage: faulty.storage });
  everyone = (await t.signIn(['technician', 'author', 'support', 'manager', 'admin'])).agent;
});
afterAll(async () => t?.close());
beforeEach(() => {
  faulty.state.fault = null;
  faulty.state.putsBeforeFault = 0;
  faulty.state.puts.length = 0;
});

const photo = () =>
  sharp({ create: { width: 1200, height: 800, channels: 3, background: { r: 30, g: 160, b: 90 } } })
    .png()
    .toBuffer();
const pdf = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj 2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');
const fileRows = async () => Number((await t.db('files').count<{ count: string }[]>('* as count'))[0].count);

describe('when the disk refuses a write', () => {
  const cases: { fault: Fault; status: number; code: string; message: RegExp }[] = [
    { fault: 'ENOSPC', status: 507, code: 'insufficient_storage', message: /^The file could not be stored: the file storage is full\. Nothing was saved/ },
    { fault: 'EACCES', status: 503, code: 'unavailable', message: /^The file could not be stored: the file storage refused the write or is not reachable\. Nothing was saved/ },
    { fault: 'EROFS', status: 503, code: 'unavailable', message: /^The file could not be stored: the file storage refused the write/ },
    { fault: 'EIO', status: 503, code: 'unavailable', message: /^The file could not be stored/ },
  ];

  for (const c of cases) {
    for (const failAt of [0, 2]) {
      it(`when ${c.fault} hits the ${failAt === 0 ? 'first' : 'third'} size of a photo, then ${c.status} ${c.code}, no row, and no byte of it left on disk`, async () => {
        const rows = await fileRows();
        const keysBefore = await faulty.inner.list();
        faulty.state.fault = c.fault;
        faulty.state.putsBeforeFault = failAt;
        const res = await everyone.post('/api/files').attach('file', await photo(), 'seat.png');
        expect(res.status, JSON.stringify(res.body)).toBe(c.status);
        expect(res.body).toEqual({ error: { code: c.code, message: expect.stringMatching(c.message), fields: { file: expect.any(String) }, requestId: expect.any(String) } });
        expect(JSON.stringify(res.body), 'no system detail leaks').not.toMatch(/simulated|ENOSPC|EACCES|EROFS|\/tmp\//);
        expect(faulty.state.puts.length, 'the fault was reached').toBe(failAt + 1);
        expect(await fileRows()).toBe(rows);
        expect(await faulty.inner.list(), 'the half-written file and the sizes before it are gone').toEqual(keysBefore);
      });
    }
  }

  it('when a PDF cannot be written, then 507 and nothing stored; once the disk has room again, the same upload succeeds', async () => {
    const rows = await fileRows();
    faulty.state.fault = 'ENOSPC';
    const refused = await everyone.post('/api/files').attach('file', pdf, 'sheet.pdf');
    expect(refused.status).toBe(507);
    expect(await faulty.inner.list()).not.toContainEqual(expect.stringMatching(/original\.pdf$/));
    faulty.state.fault = null;
    const ok = await everyone.post('/api/files').attach('file', pdf, 'sheet.pdf');
    expect(ok.status).toBe(201);
    expect(await fileRows()).toBe(rows + 1);
    expect((await everyone.get(ok.body.file.urls.original)).status).toBe(200);
  });

  it('when an upload failed, then no later record can point at it: an id that was never stored does not attach to a case note', async () => {
    const rows = await fileRows();
    faulty.state.fault = 'ENOSPC';
    const refused = await everyone.post('/api/files').attach('file', await photo(), 'case.png');
    expect(refused.status).toBe(507);
    expect(refused.body.file).toBeUndefined();
    // A case note is one of the records that carries attachments: an id that was never stored is refused.
    const kase = await everyone.post('/api/cases').send({ callerName: 'Line 3 lead', site: 'North works', symptom: 'Bead skips after restart' });
    expect(kase.status, JSON.stringify(kase.body)).toBe(201);
    const caseId = kase.body.case?.id ?? kase.body.id;
    const note = await everyone.post(`/api/cases/${caseId}/notes`).send({ text: 'photo of the seat', fileIds: [randomUUID()] });
    expect(note.status, JSON.stringify(note.body)).toBeGreaterThanOrEqual(400);
    expect(note.status).toBeLessThan(500);
    expect(await fileRows()).toBe(rows);
  });

  it('when every state-changing route in the route table is sent a multipart photo while the disk is full, then each route that writes bytes answers 507, the rest never touch storage, and no row or byte is left', async () => {
    const rows = await fileRows();
    const keysBefore = await faulty.inner.list();
    faulty.state.fault = 'ENOSPC';
    const writers: string[] = [];
    const image = await photo();
    const routes = t.app.locals.routeTable.filter((r) => ['post', 'put', 'patch'].includes(r.method) && !r.path.startsWith('/api/auth/'));
    expect(routes.length).toBeGreaterThan(30);
    for (const r of routes) {
      const path = r.path.replace(/:(\w+)/g, (_m, name: string) => (/id$/i.test(name) && !/^(walkId|fileId|id)$/.test(name) ? '999999' : randomUUID()));
      const before = faulty.state.puts.length;
      const res = await everyone[r.method as 'post'](path).attach('file', image, 'upload.png');
      const label = `${r.method.toUpperCase()} ${r.path}`;
      expect(res.status, `${label}: ${JSON.stringify(res.body)}`).toBeLessThan(500 + (faulty.state.puts.length > before ? 8 : 0));
      if (faulty.state.puts.length > before) {
        writers.push(label);
        expect(res.status, label).toBe(507);
        expect(res.body.error.code, label).toBe('insufficient_storage');
      }
    }
    // Today the one route that stores bytes; others attach stored files by id.
    expect(writers).toEqual(['POST /api/files']);
    expect(await fileRows()).toBe(rows);
    expect(await faulty.inner.list()).toEqual(keysBefore);
  });
});
