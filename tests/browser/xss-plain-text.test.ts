// Cross-site scripting through plain-text fields: OWASP filter-evasion vectors are stored through
// the API, as the demo people, in every plain-text field that is shown back (guide and article
// titles and symptoms, step titles and choices, cause and tag labels, site, line and applicator
// names and tags and own fields, service-event notes, case callers and notes, walk places and
// notes, user and organisation names). Then every page that shows them is opened in Chromium:
// no script runs (a window.__xss trap, dialogs, CSP reports), no element or attribute is
// injected, and the text is shown literally.
import { readFileSync } from 'node:fs';
import type { APIRequestContext, Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { XSS_VECTORS } from '../fixtures/xss-vectors';
import { DEMO_PASSWORD, baseUrl, launch } from '../helpers/browser';

/** Starts every payload: short enough for a 40-character valve tag, and plain to find in the page's text. */
const HEAD = 'Zq<img src=x onerror=window.__xss=1>';
/** HEAD, then as many fixture vectors as fit in max characters. */
function payload(max: number, from = 0): string {
  let out = HEAD;
  for (let i = 0; i < XSS_VECTORS.length; i++) {
    const v = XSS_VECTORS[(from + i) % XSS_VECTORS.length];
    if (out.length + 1 + v.length > max) continue;
    out += ` ${v}`;
  }
  return out;
}

let browser: Browser;
const people: Record<string, { ctx: BrowserContext; api: APIRequestContext }> = {};
const headers = () => ({ Origin: baseUrl() });
const ids: Record<string, number> = {};
let originalOrgName = '';

async function as(email: string) {
  if (people[email]) return people[email];
  const ctx = await browser.newContext({ baseURL: baseUrl(), viewport: { width: 1366, height: 900 } });
  // The trap: any vector that runs sets window.__xss or opens a dialog; CSP refusals are counted too.
  await ctx.addInitScript(() => {
    const w = window as unknown as { __xssHits: string[]; __cspReports: string[] };
    w.__xssHits = [];
    w.__cspReports = [];
    Object.defineProperty(window, '__xss', {
      configurable: false,
      get: () => undefined,
      set: (v) => w.__xssHits.push(`__xss=${String(v)}`),
    });
    for (const name of ['alert', 'confirm', 'prompt'] as const) {
      (window as unknown as Record<string, unknown>)[name] = (...args: unknown[]) => void w.__xssHits.push(`${name}(${args.map(String).join(',')})`);
    }
    // 'eval' is a library probing whether it may compile code (zod does); CSP refuses it, and no stored text is involved.
    document.addEventListener('securitypolicyviolation', (e) => {
      if (e.blockedURI !== 'eval') w.__cspReports.push(`${e.violatedDirective} ${e.blockedURI}`);
    });
  });
  const api = ctx.request;
  const res = await api.post('/api/auth/login', { data: { email, password: DEMO_PASSWORD }, headers: headers() });
  expect(res.status(), `sign-in of ${email}`).toBe(200);
  people[email] = { ctx, api };
  return people[email];
}

async function call(email: string, method: 'post' | 'put' | 'patch', path: string, data: unknown, status = [200, 201]) {
  const { api } = await as(email);
  const res = await api[method](path, { data, headers: headers() });
  const body = await res.json().catch(() => null);
  expect(status, `${method.toUpperCase()} ${path} as ${email}: ${res.status()} ${JSON.stringify(body).slice(0, 600)}`).toContain(res.status());
  return body;
}

/** Everything on the page that could run script or was injected as markup, in the page's own words. */
async function injected(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const bad: string[] = [];
    const urlAttrs = new Set(['href', 'src', 'action', 'formaction', 'background', 'dynsrc', 'lowsrc', 'data', 'poster', 'xlink:href']);
    for (const el of Array.from(document.querySelectorAll('*'))) {
      const tag = el.tagName.toLowerCase();
      for (const a of Array.from(el.attributes)) {
        const name = a.name.toLowerCase();
        const value = a.value.replace(/[\s\u0000-\u001f]/g, '').toLowerCase();
        if (name.startsWith('on')) bad.push(`${tag}[${name}]`);
        if (urlAttrs.has(name) && /^(javascript|vbscript|data:text\/html)/.test(value)) bad.push(`${tag}[${name}=${a.value.slice(0, 40)}]`);
        if (name === 'style' && /expression|javascript:|url\(/i.test(a.value)) bad.push(`${tag}[style=${a.value.slice(0, 40)}]`);
      }
      if (['iframe', 'frame', 'object', 'embed', 'base', 'bgsound', 'applet', 'math'].includes(tag)) bad.push(`<${tag}>`);
      if (tag === 'meta' && el.getAttribute('http-equiv')) bad.push('<meta http-equiv>');
      if (tag === 'script' && !(el as HTMLScriptElement).src.startsWith(location.origin)) bad.push(`<script ${(el as HTMLScriptElement).src || 'inline'}>`);
      if (tag === 'img' && /(^|\/)x$/.test(el.getAttribute('src') ?? '')) bad.push('<img src=x>');
      if (tag === 'link' && /^javascript/i.test(el.getAttribute('href') ?? '')) bad.push('<link javascript>');
    }
    const w = window as unknown as { __xssHits: string[]; __cspReports: string[] };
    return [...w.__xssHits.map((h) => `ran: ${h}`), ...w.__cspReports.map((r) => `CSP refused: ${r}`), ...bad];
  });
}

interface Visit {
  who: string;
  path: string;
  /** Text that must be on the page, literally. */
  shows?: string[];
  /** Waits for the page's content before checking. */
  ready?: (page: Page) => Promise<unknown>;
}
const visited: string[] = [];
const findings: string[] = [];

async function visit(v: Visit) {
  const { ctx } = await as(v.who);
  const page = await ctx.newPage();
  const problems: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  page.on('dialog', (d) => {
    problems.push(`dialog: ${d.message()}`);
    void d.dismiss();
  });
  await page.goto(v.path);
  const shows = v.shows ?? [HEAD];
  // On a machine busy with other test files a page now and then has not shown its text in time:
  // it gets one reload and a longer wait before that counts as a finding.
  const appeared = (timeout: number) =>
    (v.ready ? v.ready(page) : page.getByText(HEAD, { exact: false }).first().waitFor({ timeout })).then(
      () => true,
      () => false,
    );
  if (!(await appeared(20_000))) {
    await page.reload();
    if (await appeared(40_000)) console.info(`${v.path} as ${v.who}: the stored text appeared only after a reload`);
    else findings.push(`${v.path} as ${v.who}: the stored text never appeared`);
  }
  // Hover over whatever shows a payload, in case a handler slipped through.
  for (const el of (await page.getByText('Zq<img', { exact: false }).all()).slice(0, 25)) await el.hover({ timeout: 500 }).catch(() => undefined);
  await page.waitForTimeout(200);
  const text = await page.evaluate(() => document.body.innerText);
  for (const s of shows) if (!text.includes(s)) findings.push(`${v.path} as ${v.who}: does not show literally ${JSON.stringify(s.slice(0, 60))}`);
  for (const bad of await injected(page)) findings.push(`${v.path} as ${v.who}: ${bad}`);
  for (const p of problems) findings.push(`${v.path} as ${v.who}: ${p}`);
  visited.push(`${v.who} ${v.path}`);
  await page.close();
}

beforeAll(async () => {
  browser = await launch();
}, 60_000);

afterAll(async () => {
  // Put back what other browser tests read: the organisation's name; the vector guide and article go away.
  if (originalOrgName) await call('admin@example.com', 'patch', '/api/admin/settings', { name: originalOrgName }).catch(() => undefined);
  if (ids.guide) await call('author@example.com', 'post', `/api/guides/${ids.guide}/retire`, {}).catch(() => undefined);
  if (ids.article) await call('author@example.com', 'post', `/api/articles/${ids.article}/archive`, {}).catch(() => undefined);
  for (const p of Object.values(people)) await p.ctx.close();
  await browser?.close();
});

describe('plain text with script vectors', () => {
  it('when markup is put into a page on purpose, then the checks below see it (so they can fail)', async () => {
    const { ctx } = await as('tech@example.com');
    const page = await ctx.newPage();
    await page.goto('/help');
    await page.getByRole('heading').first().waitFor();
    expect(await injected(page)).toEqual([]);
    await page.evaluate((html) => document.body.insertAdjacentHTML('beforeend', html), `${HEAD}<a href="javascript:window.__xss=2">x</a><iframe></iframe>`);
    await page.evaluate(() => ((window as unknown as { __xss: number }).__xss = 3));
    await page.waitForTimeout(200);
    const seen = await injected(page);
    expect(seen).toEqual(expect.arrayContaining(['ran: __xss=3', 'img[onerror]', '<img src=x>', 'a[href=javascript:window.__xss=2]', '<iframe>']));
    // The inline handler was refused by the Content-Security-Policy as well.
    expect(seen.some((s) => s.startsWith('CSP refused: script-src'))).toBe(true);
    await page.close();
  });

  it('when script vectors are stored in every plain-text field, then every page shows them as text and none runs', async () => {
    const AUTHOR = 'author@example.com';
    const REVIEWER = 'author2@example.com';
    const TECH = 'tech@example.com';
    const SUPPORT = 'support@example.com';
    const ADMIN = 'admin@example.com';
    const MANAGER = 'manager@example.com';

    // ---- Organisation, people, tags ----
    const settings = await (await as(ADMIN)).api.get('/api/admin/settings');
    expect(settings.status()).toBe(200);
    originalOrgName = (await settings.json()).settings.name;
    expect(originalOrgName).toBeTruthy();
    await call(ADMIN, 'patch', '/api/admin/settings', { name: payload(120, 1) });
    const invited = await call(ADMIN, 'post', '/api/admin/users', { name: payload(120, 2), email: 'xss.person@example.com', roles: ['technician'] });
    ids.person = invited.user?.id;
    const tags = (await (await (await as(ADMIN)).api.get('/api/admin/tags')).json()).tags as { group: string; slug: string; label: string; active: boolean }[];
    await call(ADMIN, 'put', '/api/admin/tags', {
      tags: [...tags.map(({ group, slug, label, active }) => ({ group, slug, label, active })), { group: tags[0].group, slug: 'xss-tag', label: payload(80, 3), active: true }],
    });

    // ---- A guide imported from a file whose every title, label and cause carries vectors ----
    const file = JSON.parse(readFileSync(new URL('../../content/guides/bead-skips.json', import.meta.url), 'utf8').replaceAll('"supply-empty"', '"xss-supply-empty"'));
    file.guide.title = payload(120, 4);
    file.guide.symptom = payload(200, 5);
    file.guide.summary = payload(400, 6);
    file.guide.tags = [...file.guide.tags, 'xss-tag'];
    for (const c of file.guide.causes) if (c.code === 'xss-supply-empty') c.label = payload(80, 7);
    file.content.steps.forEach((s: { title: string; choices?: { label: string }[] }, n: number) => {
      s.title = `${payload(100, 8 + n)} #${n}`;
      for (const c of s.choices ?? []) c.label = `${payload(100, 9 + n)}`;
    });
    const imported = await call(AUTHOR, 'post', '/api/guides/import', file);
    ids.guide = imported.guide.id;
    await call(AUTHOR, 'post', `/api/guides/${ids.guide}/submit`, {});
    await call(REVIEWER, 'post', `/api/guides/${ids.guide}/approve`, { comment: payload(500, 10) });

    // ---- An article with vectors in its title and summary ----
    const article = await call(AUTHOR, 'post', '/api/articles', {
      title: payload(160, 11),
      summary: payload(400, 12),
      body: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Relieve the pressure before opening the nozzle.' }] }] },
      keywords: ['Zq<svg/onload=window.__xss=1>'],
    });
    ids.article = article.article.id;
    await call(AUTHOR, 'post', `/api/articles/${ids.article}/submit`, {});
    await call(REVIEWER, 'post', `/api/articles/${ids.article}/approve`, {});

    // ---- The asset register: site, line, own field, valve, readings, a service event ----
    const site = await call(ADMIN, 'post', '/api/sites', { name: payload(120, 13), address: payload(400, 14), contact: payload(200, 15) });
    const line = await call(ADMIN, 'post', '/api/lines', { siteId: site.site.id, name: payload(120, 16), area: payload(200, 17), contact: payload(200, 18) });
    const field = await call(ADMIN, 'post', '/api/applicators/fields', { name: payload(60, 19), type: 'text' });
    const valve = await call(ADMIN, 'post', '/api/applicators', {
      lineId: line.line.id,
      tag: HEAD,
      actuation: 'electric',
      coilDrive: 'high-voltage',
      needleMaterial: payload(200, 20),
      seatMaterial: payload(200, 21),
      nozzle: payload(200, 22),
      fluidFamily: 'hot-melt',
      fluidName: payload(200, 23),
      installedOn: new Date(Date.now() - 400 * 86_400_000).toISOString().slice(0, 10),
      status: 'running',
      cyclesPerMinute: 200,
      hoursPerDay: 20,
      daysPerWeek: 7,
      seatIntervalCycles: 1_000_000,
      custom: { [field.field.id]: payload(200, 24) },
    });
    ids.valve = valve.applicator.id;
    const day = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
    await call(TECH, 'post', `/api/applicators/${ids.valve}/readings`, { readOn: day(30), count: 100_000, note: payload(1000, 25) });
    await call(TECH, 'post', `/api/applicators/${ids.valve}/readings`, { readOn: day(2), count: 9_000_000, note: payload(1000, 26) });
    await call(TECH, 'post', `/api/applicators/${ids.valve}/service-events`, {
      performedOn: day(10),
      actions: ['seat-replaced', 'other'],
      otherAction: payload(200, 27),
      causeCode: 'xss-supply-empty',
      parts: [{ name: payload(120, 28), partNumber: 'Zq<svg/onload=window.__xss=1>', quantity: 1 }],
      performedBy: payload(120, 29),
      notes: payload(4000, 30),
    });

    // ---- A walk on the guide with vector places and a note ----
    const walk = await call(TECH, 'post', '/api/walks', { guideId: ids.guide, site: payload(120, 31), line: payload(120, 32), applicator: payload(40, 33) });
    ids.walk = walk.walk?.id ?? walk.id;
    const stepId = file.content.startStepId as string;
    await call(TECH, 'post', `/api/walks/${ids.walk}/notes`, { clientId: `xssnote-${Date.now()}`, stepId, text: payload(2000, 34) });

    // ---- A support case with vectors from the caller, a note and a hand-off ----
    const kase = await call(SUPPORT, 'post', '/api/cases', {
      callerName: payload(120, 35),
      callerCompany: payload(160, 36),
      callerPhone: '+44 0000 000000',
      site: payload(120, 37),
      line: payload(120, 38),
      applicator: payload(120, 39),
      symptom: payload(500, 40),
    });
    ids.case = kase.case?.id ?? kase.id;
    await call(SUPPORT, 'post', `/api/cases/${ids.case}/notes`, { text: payload(5000, 41) });

    // ---- Every page that shows them ----
    const visits: Visit[] = [
      { who: TECH, path: '/' },
      { who: TECH, path: '/guides' },
      { who: TECH, path: `/guides/${ids.guide}` },
      { who: TECH, path: `/guides/${ids.guide}/print` },
      { who: TECH, path: `/guides/${ids.guide}/walk` },
      { who: TECH, path: `/walks/${ids.walk}` },
      { who: TECH, path: `/walks/${ids.walk}/summary` },
      { who: AUTHOR, path: `/guides/${ids.guide}/edit` },
      { who: TECH, path: '/articles' },
      { who: TECH, path: `/articles/${ids.article}` },
      { who: AUTHOR, path: `/articles/${ids.article}/history` },
      { who: TECH, path: `/search?q=${encodeURIComponent('img onerror xss')}` },
      { who: TECH, path: `/search?q=${encodeURIComponent('Zq')}` },
      { who: TECH, path: '/applicators' },
      { who: TECH, path: '/applicators/sites' },
      { who: TECH, path: `/applicators/${ids.valve}` },
      { who: ADMIN, path: `/applicators/${ids.valve}/edit` },
      { who: ADMIN, path: '/applicators/labels' },
      { who: SUPPORT, path: '/cases' },
      { who: SUPPORT, path: `/cases/${ids.case}` },
      { who: MANAGER, path: '/insights' },
      { who: MANAGER, path: '/insights/forecast' },
      { who: MANAGER, path: '/insights/guides' },
      { who: ADMIN, path: '/admin/users' },
      { who: ADMIN, path: '/admin/settings' },
      { who: ADMIN, path: '/admin/audit' },
      { who: ADMIN, path: '/admin/outbox' },
      { who: MANAGER, path: `/walks/${ids.walk}/summary` },
    ];
    for (const v of visits) await visit(v);

    expect(visited).toHaveLength(visits.length);
    expect(findings).toEqual([]);
  }, 420_000);
});
