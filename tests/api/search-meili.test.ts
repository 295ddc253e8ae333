// Search with Meilisearch configured, against the local fake: documents follow publish, archive
// and retire through the queue; filters and the organisation/published filter are applied by the
// server; when the fake is down or too slow PostgreSQL answers, the incident is counted once, and
// the updates it missed are replayed when it is back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Logger } from 'pino';
import { syncSearch } from '../../server/modules/search/search.routes';
import { indexUid, MeiliHealth } from '../../server/modules/search/search.meili';
import { startFakeMeili, type FakeMeili } from '../fakes/meilisearch';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
let fake: FakeMeili;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
type Json = Record<string, any>;
let author: Agent;
let reviewer: Agent;
let tech: Agent;
let admin: Agent;

const para = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] });
const bare = { cautions: [], photoIds: [], articleIds: [] };
const content = (ask: string, cause: string) => ({
  startStepId: 'start',
  steps: [
    {
      kind: 'ask',
      id: 'start',
      title: ask,
      ...bare,
      choices: [
        { id: 'yes', label: 'Yes', next: 'found' },
        { id: 'no', label: 'No', next: 'call' },
      ],
    },
    { kind: 'finding', id: 'found', title: 'Seat fouled', ...bare, causeCode: 'seat-debris', cause, remedy: ['Clean the seat.'], parts: [] },
    { kind: 'handoff', id: 'call', title: 'Call the application engineer', ...bare, contact: 'Application engineer', message: 'Say what you checked.' },
  ],
});

async function publishArticle(title: string, text: string, tags: string[] = []) {
  const res = await author.post('/api/articles').send({ title, summary: '', body: { type: 'doc', content: [para(text)] }, tags });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const id = res.body.article.id as number;
  await author.post(`/api/articles/${id}/submit`).expect(200);
  await reviewer.post(`/api/articles/${id}/approve`).send({}).expect(200);
  return id;
}

async function publishGuide(title: string, symptom: string, tags: string[], ask: string, cause: string) {
  const res = await author.post('/api/guides').send({ title, symptom, summary: '', tags, content: content(ask, cause) });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const id = res.body.guide.id as number;
  await author.post(`/api/guides/${id}/submit`).send({}).expect(200);
  await reviewer.post(`/api/guides/${id}/approve`).send({}).expect(200);
  return id;
}

const search = (params: Record<string, string>, agent = tech) => agent.get('/api/search').query(params);
const docIds = (name: 'guides' | 'steps' | 'articles') => fake.documents(indexUid(t.organisationId, name)).map((d) => d.id);
const status = async () => (await admin.get('/api/admin/search')).body.status as Json;

let dripGuide: number;
let weepGuide: number;
let seatArticle: number;

beforeAll(async () => {
  fake = await startFakeMeili();
  t = await startTestApp({ MEILI_URL: fake.url, MEILI_API_KEY: fake.apiKey, MEILI_TIMEOUT_MS: '250' });
  author = (await t.signIn(['author'])).agent;
  reviewer = (await t.signIn(['author'])).agent;
  tech = (await t.signIn(['technician'])).agent;
  admin = (await t.signIn(['admin'])).agent;
  dripGuide = await publishGuide('Drips after the valve closes', 'Drips after the solenoid valve closes', ['electric', 'seat'], 'Does a drop form after each shot?', 'Cured adhesive on the seat.');
  weepGuide = await publishGuide('Seal weep on an air-operated valve', 'Fluid at the weep hole', ['air-operated', 'dynamic-seals'], 'Is there fluid on the air side?', 'The shaft seal is worn.');
  seatArticle = await publishArticle('Reading a worn seat under a loupe', 'A wide frosted band means the seat is worn.', ['seat', 'electric']);
  await syncSearch(t.db);
});
afterAll(async () => {
  await t?.close();
  await fake?.close();
});

describe('indexing through the queue', () => {
  it('when guides and articles are published, then their documents, steps and settings reach Meilisearch', async () => {
    expect(docIds('guides').sort()).toEqual([dripGuide, weepGuide].sort());
    expect(docIds('articles')).toEqual([seatArticle]);
    expect(docIds('steps')).toEqual(expect.arrayContaining([`${dripGuide}-start`, `${dripGuide}-found`, `${weepGuide}-call`]));
    const settings = fake.settings(indexUid(t.organisationId, 'guides'))!;
    expect(settings.filterableAttributes).toEqual(expect.arrayContaining(['organisationId', 'state', 'actuation', 'component', 'fluid']));
    expect(settings.synonyms.drool).toEqual(expect.arrayContaining(['drip', 'dribble']));
    const doc = fake.documents(indexUid(t.organisationId, 'guides')).find((d) => d.id === dripGuide)!;
    expect(doc).toMatchObject({ organisationId: t.organisationId, state: 'published', actuation: ['electric'], component: ['seat'] });
  });

  it('when a technician searches, then Meilisearch answers, says so, and marks the words', async () => {
    const res = await search({ q: 'drool' });
    expect(res.status).toBe(200);
    expect(res.headers['x-search-engine']).toBe('meilisearch');
    expect(res.body).toMatchObject({ engine: 'meilisearch', fallback: false });
    expect(res.body.results[0]).toMatchObject({ kind: 'guide', id: dripGuide });
    expect(res.body.results[0].snippetHtml).toMatch(/<mark>Drips<\/mark>/);
    const typo = await search({ q: 'selenoid' });
    expect(typo.body.results[0]).toMatchObject({ kind: 'guide', id: dripGuide });
    const sent = fake.requests.filter((r) => r.path === '/multi-search').at(-1)!.body as Json;
    for (const q of sent.queries) expect(q.filter).toBe(`organisationId = ${t.organisationId} AND state = "published"`);
  });

  it('when a guide is found only through a step, then the guide comes back with that step', async () => {
    const res = await search({ q: 'air side', kind: 'guide' });
    expect(res.body.results[0]).toMatchObject({ kind: 'guide', id: weepGuide });
  });

  it('when filters are given, then they reach Meilisearch as filters and only tagged items return', async () => {
    const res = await search({ q: 'seat', actuation: 'electric' });
    expect(res.body.engine).toBe('meilisearch');
    expect(res.body.results.map((r: Json) => r.id).sort()).toEqual([dripGuide, seatArticle].sort());
    const sent = fake.requests.filter((r) => r.path === '/multi-search').at(-1)!.body as Json;
    expect(sent.queries[0].filter).toContain('actuation = "electric"');
    const air = await search({ q: 'valve', actuation: 'air-operated' });
    expect(air.body.results.map((r: Json) => r.id)).toEqual([weepGuide]);
    expect((await search({ q: 'valve', actuation: 'pneumatic-ish' })).status).toBe(400);
  });

  it('when an article is archived and a guide retired, then their documents and steps are removed; restoring brings them back', async () => {
    await author.post(`/api/articles/${seatArticle}/archive`).expect(200);
    await author.post(`/api/guides/${weepGuide}/retire`).expect(200);
    await syncSearch(t.db);
    expect(docIds('articles')).not.toContain(seatArticle);
    expect(docIds('guides')).not.toContain(weepGuide);
    expect(docIds('steps').filter((id) => String(id).startsWith(`${weepGuide}-`))).toEqual([]);
    expect((await search({ q: 'weep hole' })).body.results).toEqual([]);
    await author.post(`/api/articles/${seatArticle}/unarchive`).expect(200);
    await author.post(`/api/guides/${weepGuide}/restore`).expect(200);
    await syncSearch(t.db);
    expect(docIds('articles')).toContain(seatArticle);
    expect(docIds('guides')).toContain(weepGuide);
  });

  it('when drafts exist, or stray documents sit in the index, then no role finds them through Meilisearch', async () => {
    const draft = await author.post('/api/articles').send({ title: 'Zanthorium draft', summary: '', body: { type: 'doc', content: [para('zanthorium')] }, tags: [] });
    expect(draft.status).toBe(201);
    await syncSearch(t.db);
    expect(docIds('articles')).not.toContain(draft.body.article.id);
    // Documents that should never be there: the server's own filter must still keep them out.
    const uid = indexUid(t.organisationId, 'articles');
    await fetch(`${fake.url}/indexes/${uid}/documents`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${fake.apiKey}`, 'Content-Type': 'application/json' },
      body: JSON.stringify([
        { id: 900001, organisationId: t.organisationId, state: 'draft', title: 'Zanthorium stray draft', tags: [] },
        { id: 900002, organisationId: t.organisationId + 1000, state: 'published', title: 'Zanthorium from elsewhere', tags: [] },
      ]),
    });
    for (const role of ['technician', 'support', 'manager', 'author', 'admin'] as const) {
      const agent = (await t.signIn([role])).agent;
      const res = await search({ q: 'zanthorium' }, agent);
      expect(res.body.engine, role).toBe('meilisearch');
      expect(res.body.results, role).toEqual([]);
    }
  });
});

describe('falling back to PostgreSQL', () => {
  it('when the search server is stopped, then PostgreSQL answers, the incident is counted once, and missed updates are replayed when it is back', async () => {
    await fake.stop();
    const down = await search({ q: 'drips' });
    expect(down.status).toBe(200);
    expect(down.headers['x-search-engine']).toBe('postgres');
    expect(down.body).toMatchObject({ engine: 'postgres', fallback: true });
    expect(down.body.results[0]).toMatchObject({ id: dripGuide });
    for (let i = 0; i < 4; i++) expect((await search({ q: 'weep' })).body.engine).toBe('postgres');

    const fresh = await publishArticle('Quorvelite nozzle cleaning', 'quorvelite is a nozzle probe', ['nozzle']);
    await syncSearch(t.db);
    let s = await status();
    expect(s).toMatchObject({ configured: 'meilisearch', answering: 'postgres' });
    expect(s.meili.incidents).toBe(1);
    expect(s.meili.healthy).toBe(false);
    expect(s.jobs.find((j: Json) => j.target === 'meilisearch').pending).toBeGreaterThan(0);
    expect((await search({ q: 'quorvelite' })).body.results[0]).toMatchObject({ id: fresh });

    await fake.start();
    await syncSearch(t.db);
    expect(docIds('articles')).toContain(fresh);
    s = await status();
    expect(s).toMatchObject({ answering: 'meilisearch' });
    expect(s.meili.incidents).toBe(1);
    expect(s.jobs.find((j: Json) => j.target === 'meilisearch').pending).toBe(0);
    const back = await search({ q: 'quorvelite' });
    expect(back.body).toMatchObject({ engine: 'meilisearch', fallback: false });
    expect(back.body.results[0]).toMatchObject({ id: fresh });
  });

  it('when the search server answers slower than the timeout, then PostgreSQL answers in time', async () => {
    fake.setSearchDelay(2000);
    const started = Date.now();
    const res = await search({ q: 'drips' });
    const took = Date.now() - started;
    fake.setSearchDelay(0);
    expect(res.body).toMatchObject({ engine: 'postgres', fallback: true });
    expect(res.body.results[0]).toMatchObject({ id: dripGuide });
    expect(took).toBeLessThan(1500);
    expect((await status()).meili.incidents).toBe(2);
    await syncSearch(t.db);
    expect((await search({ q: 'drips' })).body.engine).toBe('meilisearch');
  });

  it('when failures repeat within one incident, then it is logged once when it starts and once when it ends', async () => {
    const lines: string[] = [];
    const logger = { warn: (_o: unknown, m: string) => lines.push(`warn ${m}`), info: (_o: unknown, m: string) => lines.push(`info ${m}`) } as unknown as Logger;
    let replays = 0;
    const health = new MeiliHealth(
      logger,
      () => {
        replays++;
      },
      0,
    );
    for (let i = 0; i < 5; i++) health.failure(new Error('connect ECONNREFUSED'), 'search');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^warn /);
    await health.success();
    await health.success();
    expect(lines).toHaveLength(2);
    expect(lines[1]).toMatch(/^info /);
    expect(replays).toBe(1);
    health.failure(new Error('timeout'), 'search');
    expect(lines).toHaveLength(3);
    expect(health.incidents).toBe(2);
  });
});
