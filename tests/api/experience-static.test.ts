// How the built client is served to phones: hashed files cached for a year, compressed; the page
// and the offline worker always checked for a new build; a file from an older build is a 404,
// never the HTML page in its place.
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp, type BeadpathApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createLogger } from '../../server/lib/logger';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
let app: BeadpathApp;

beforeAll(async () => {
  t = await startTestApp();
  const dir = mkdtempSync(join(tmpdir(), 'beadpath-client-'));
  mkdirSync(join(dir, 'assets'));
  writeFileSync(join(dir, 'index.html'), '<!doctype html><html><head><title>Beadpath</title></head><body><div id="root"></div></body></html>');
  // A build manifest as Vite writes it: the walk runner's chunk imports a shared chunk and the entry.
  mkdirSync(join(dir, '.vite'));
  writeFileSync(
    join(dir, '.vite', 'manifest.json'),
    JSON.stringify({
      'index.html': { file: 'assets/index-AbC123.js', isEntry: true },
      'src/features/walks/components/walk-runner-page.tsx': { file: 'assets/walk-runner-page-R1.js', imports: ['index.html', '_units-U1.js'] },
      '_units-U1.js': { file: 'assets/units-U1.js' },
      'src/app/routes/home.tsx': { file: 'assets/home-H1.js', imports: ['index.html', '_units-U1.js'] },
    }),
  );
  writeFileSync(join(dir, 'assets', 'index-AbC123.js'), `console.log(${JSON.stringify('x'.repeat(4000))});`);
  writeFileSync(join(dir, 'sw.js'), 'self.addEventListener("fetch", () => {});');
  writeFileSync(join(dir, 'manifest.webmanifest'), '{"name":"Beadpath"}');
  const config = loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: t.dbUrl,
    SESSION_SECRET: randomBytes(32).toString('hex'),
    LOG_LEVEL: 'silent',
    FILES_DIR: mkdtempSync(join(tmpdir(), 'beadpath-files-')),
    FAKE_SMTP: '1',
  });
  app = createApp({ db: t.db, config, logger: createLogger('silent'), clientDir: dir, version: 'test' });
});
afterAll(async () => {
  await app?.locals.close?.();
  await t?.close();
});

describe('serving the built client', () => {
  it('when a hashed file is asked for, then it is cached for a year as immutable and sent compressed', async () => {
    const res = await request(app).get('/assets/index-AbC123.js').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['cache-control']).toMatch(/max-age=31536000/);
    expect(res.headers['cache-control']).toMatch(/immutable/);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.headers['content-type']).toMatch(/javascript/);
  });

  it('when a hashed file from an older build is asked for, then the answer is 404 text, not the page', async () => {
    const res = await request(app).get('/assets/index-Gone999.js');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/text\/plain/);
    expect(res.headers['cache-control']).toBe('no-store');
    expect(res.text).not.toContain('<!doctype html>');
  });

  it('when the page, the offline worker or the manifest is asked for, then the browser must check for a newer one', async () => {
    for (const path of ['/', '/walks/12', '/sw.js', '/manifest.webmanifest']) {
      const res = await request(app).get(path);
      expect(res.status, path).toBe(200);
      expect(res.headers['cache-control'], path).toMatch(/no-cache/);
    }
    expect((await request(app).get('/walks/12')).text).toContain('<div id="root">');
  });

  it("when a signed-in phone opens a walk, then the page names the walk, the session check and the runner's code to fetch at once", async () => {
    const res = await request(app).get('/walks/12').set('Cookie', 'beadpath.sid=s%3Aanything');
    expect(res.headers['cache-control']).toMatch(/private/);
    const head = res.text.slice(0, res.text.indexOf('</head>'));
    expect(head).toContain('<link rel="preload" as="fetch" crossorigin href="/api/auth/me">');
    expect(head).toContain('<link rel="preload" as="fetch" crossorigin href="/api/walks/12">');
    expect(head).toContain('<link rel="modulepreload" crossorigin href="/assets/walk-runner-page-R1.js">');
    expect(head).toContain('<link rel="modulepreload" crossorigin href="/assets/units-U1.js">');
    // The entry is already in the page as its script; no hint names it again.
    expect(head).not.toContain('index-AbC123.js');
    const home = (await request(app).get('/').set('Cookie', 'beadpath.sid=s%3Aanything')).text;
    expect(home).toContain('href="/assets/home-H1.js"');
    expect(home).not.toContain('/api/walks/');
  });

  it('when the page is asked for without a session cookie, or for an address that is not a walk, then it carries no walk hints', async () => {
    const anonymous = (await request(app).get('/walks/12')).text;
    expect(anonymous).not.toContain('preload');
    const other = (await request(app).get('/walks/12/summary').set('Cookie', 'beadpath.sid=s%3Aanything')).text;
    expect(other).toContain('href="/api/auth/me"');
    expect(other).not.toContain('/api/walks/');
    expect(other).not.toContain('modulepreload');
    const odd = (await request(app).get('/walks/12%22%3E%3Cscript%3E').set('Cookie', 'beadpath.sid=s%3Aanything')).text;
    expect(odd).not.toContain('<script>');
  });
});
