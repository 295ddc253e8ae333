// Pins the shapes the official meilisearch client sends to the fake and expects back, for every
// call Beadpath makes: if the client changes what it sends or the fake drifts from what the client
// parses, this fails before the search tests quietly test nothing.
import { Meilisearch, MeilisearchApiError, MeilisearchRequestError, MeilisearchRequestTimeOutError } from 'meilisearch';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startFakeMeili, type FakeMeili } from '../fakes/meilisearch';

let fake: FakeMeili;
let client: Meilisearch;

beforeAll(async () => {
  fake = await startFakeMeili({ apiKey: 'contract-key' });
  client = new Meilisearch({ host: fake.url, apiKey: fake.apiKey, timeout: 2000 });
});
afterAll(async () => fake?.close());
beforeEach(() => {
  fake.requests.length = 0;
});

const last = () => fake.requests[fake.requests.length - 1];

describe('the fake Meilisearch against the official client', () => {
  it('when the client checks health, then it sends GET /health and reads the status', async () => {
    expect(await client.health()).toEqual({ status: 'available' });
    expect(last()).toMatchObject({ method: 'GET', path: '/health' });
    expect(last().headers.authorization).toBe('Bearer contract-key');
    expect(last().headers.client).toMatch(/^Meilisearch JavaScript \(v0\.62\.0\)$/);
  });

  it('when the client creates an index, then it posts uid and primaryKey and polls the task until it succeeds', async () => {
    const enqueued = await client.createIndex('contract-guides', { primaryKey: 'id' });
    expect(fake.requests[0]).toMatchObject({ method: 'POST', path: '/indexes', body: { uid: 'contract-guides', primaryKey: 'id' } });
    expect(fake.requests[0].headers.contentType).toBe('application/json');
    expect(enqueued).toMatchObject({ taskUid: expect.any(Number), indexUid: 'contract-guides', status: 'enqueued', type: 'indexCreation', enqueuedAt: expect.any(String) });
    const task = await client.tasks.waitForTask(enqueued.taskUid);
    expect(last()).toMatchObject({ method: 'GET', path: `/tasks/${enqueued.taskUid}` });
    expect(task).toMatchObject({ uid: enqueued.taskUid, status: 'succeeded', type: 'indexCreation', error: null, indexUid: 'contract-guides' });

    const again = await client.createIndex('contract-guides', { primaryKey: 'id' }).waitTask();
    expect(again.status).toBe('failed');
    expect(again.error).toMatchObject({ code: 'index_already_exists', type: 'invalid_request', message: expect.any(String), link: expect.any(String) });
  });

  it('when the client updates settings, then it patches them and reads them back unchanged', async () => {
    const settings = {
      searchableAttributes: ['title', 'symptom', 'body'],
      filterableAttributes: ['organisationId', 'state', 'actuation'],
      sortableAttributes: ['publishedAt'],
      synonyms: { drip: ['drool', 'dribble'], drool: ['drip', 'dribble'] },
    };
    const task = await client.index('contract-guides').updateSettings(settings).waitTask();
    expect(task).toMatchObject({ status: 'succeeded', type: 'settingsUpdate' });
    expect(fake.requests[0]).toMatchObject({ method: 'PATCH', path: '/indexes/contract-guides/settings', body: settings });
    expect(await client.index('contract-guides').getSettings()).toMatchObject(settings);
  });

  it('when the client adds documents, then it posts the array and the stats count them', async () => {
    const docs = [
      { id: 1, organisationId: 1, state: 'published', actuation: ['electric'], title: 'Drips after close', symptom: 'Drips after the solenoid valve closes', body: 'Clean the seat.' },
      { id: 2, organisationId: 1, state: 'published', actuation: ['air-operated'], title: 'Seal weep', symptom: 'Fluid at the weep hole', body: 'Replace the seal kit.' },
      { id: 3, organisationId: 2, state: 'published', actuation: ['electric'], title: 'Another organisation’s drips', symptom: 'Drips', body: '' },
    ];
    const task = await client.index('contract-guides').addDocuments(docs).waitTask();
    expect(task).toMatchObject({ status: 'succeeded', type: 'documentAdditionOrUpdate' });
    expect(fake.requests[0]).toMatchObject({ method: 'POST', path: '/indexes/contract-guides/documents', body: docs });
    expect((await client.index('contract-guides').getStats()).numberOfDocuments).toBe(3);
  });

  it('when the client searches with a filter, highlight and crop, then the request and the answer have the shapes Beadpath reads', async () => {
    const params = {
      filter: 'organisationId = 1 AND state = "published"',
      limit: 5,
      attributesToHighlight: ['title'],
      attributesToCrop: ['symptom', 'body'],
      cropLength: 24,
      highlightPreTag: '\u27E6',
      highlightPostTag: '\u27E7',
      showRankingScore: true,
    };
    const res = await client.index('contract-guides').search('drool', params);
    expect(fake.requests[0]).toMatchObject({ method: 'POST', path: '/indexes/contract-guides/search', body: { q: 'drool', ...params } });
    expect(res).toMatchObject({ query: 'drool', limit: 5, offset: 0, estimatedTotalHits: 1, processingTimeMs: expect.any(Number) });
    expect(res.hits).toHaveLength(1);
    expect(res.hits[0]).toMatchObject({ id: 1, _rankingScore: expect.any(Number) });
    expect(res.hits[0]._formatted?.symptom).toBe('\u27E6Drips\u27E7 after the solenoid valve closes');
  });

  it('when the query is misspelt, then typo tolerance still finds the document', async () => {
    const res = await client.index('contract-guides').search('selenoid', { filter: 'organisationId = 1' });
    expect(res.hits.map((h) => h.id)).toEqual([1]);
  });

  it('when the client multi-searches, then one request carries every query and each result names its index', async () => {
    const res = await client.multiSearch({
      queries: [
        { indexUid: 'contract-guides', q: 'weep', filter: 'actuation = "air-operated"' },
        { indexUid: 'contract-guides', q: 'drips', filter: 'organisationId = 2' },
      ],
    });
    expect(fake.requests).toHaveLength(1);
    expect(fake.requests[0]).toMatchObject({
      method: 'POST',
      path: '/multi-search',
      body: {
        queries: [
          { indexUid: 'contract-guides', q: 'weep' },
          { indexUid: 'contract-guides', q: 'drips' },
        ],
      },
    });
    expect(res.results.map((r) => [r.indexUid, r.hits.map((h) => h.id)])).toEqual([
      ['contract-guides', [2]],
      ['contract-guides', [3]],
    ]);
  });

  it('when the client deletes by ids, by filter and all, then it uses the batch, filter and collection routes', async () => {
    const idx = client.index('contract-guides');
    expect((await idx.deleteDocuments([3]).waitTask()).status).toBe('succeeded');
    expect(fake.requests[0]).toMatchObject({ method: 'POST', path: '/indexes/contract-guides/documents/delete-batch', body: [3] });
    fake.requests.length = 0;
    expect((await idx.deleteDocuments({ filter: 'actuation IN ["air-operated"]' }).waitTask()).status).toBe('succeeded');
    expect(fake.requests[0]).toMatchObject({ method: 'POST', path: '/indexes/contract-guides/documents/delete', body: { filter: 'actuation IN ["air-operated"]' } });
    expect(fake.documents('contract-guides').map((d) => d.id)).toEqual([1]);
    fake.requests.length = 0;
    expect((await idx.deleteAllDocuments().waitTask()).status).toBe('succeeded');
    expect(fake.requests[0]).toMatchObject({ method: 'DELETE', path: '/indexes/contract-guides/documents' });
    expect(fake.documents('contract-guides')).toEqual([]);
  });

  it('when a request fails, then the client throws MeilisearchApiError with the error body as its cause', async () => {
    const missing = await client
      .index('nope')
      .search('x')
      .catch((e: unknown) => e);
    expect(missing).toBeInstanceOf(MeilisearchApiError);
    expect((missing as MeilisearchApiError).response.status).toBe(404);
    expect((missing as MeilisearchApiError).cause).toMatchObject({ code: 'index_not_found', type: 'invalid_request', message: expect.any(String), link: expect.any(String) });

    const badFilter = await client
      .index('contract-guides')
      .search('x', { filter: 'body = "x"' })
      .catch((e: unknown) => e);
    expect((badFilter as MeilisearchApiError).cause?.code).toBe('invalid_search_filter');

    const wrongKey = await new Meilisearch({ host: fake.url, apiKey: 'wrong' })
      .index('contract-guides')
      .search('x')
      .catch((e: unknown) => e);
    expect((wrongKey as MeilisearchApiError).response.status).toBe(403);
    expect((wrongKey as MeilisearchApiError).cause?.code).toBe('invalid_api_key');
  });

  it('when the server is slow or down, then the client throws a request error (a timeout error when slow)', async () => {
    fake.setSearchDelay(400);
    const slow = await new Meilisearch({ host: fake.url, apiKey: fake.apiKey, timeout: 100 })
      .index('contract-guides')
      .search('x')
      .catch((e: unknown) => e);
    fake.setSearchDelay(0);
    expect(slow).toBeInstanceOf(MeilisearchRequestError);
    expect((slow as MeilisearchRequestError).cause).toBeInstanceOf(MeilisearchRequestTimeOutError);

    await fake.stop();
    const down = await client.health().catch((e: unknown) => e);
    await fake.start();
    expect(down).toBeInstanceOf(MeilisearchRequestError);
    expect(await client.health()).toEqual({ status: 'available' });
  });
});
