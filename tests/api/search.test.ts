// Search with the PostgreSQL engine over HTTP: relevance on invented trade content, synonyms,
// typo tolerance, nothing unpublished ever found by anyone, the sync job following publish,
// archive, retire and restore, and odd input answered sensibly rather than with a 500.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../src/shared/permissions';
import { syncSearch } from '../../server/modules/search/search.routes';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
type Json = Record<string, any>;
let author: Agent;
let reviewer: Agent;
let tech: Agent;
let admin: Agent;

const para = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] });
const doc = (...texts: string[]) => ({ type: 'doc', content: texts.map(para) });
const bare = { cautions: [], photoIds: [], articleIds: [] };

/** A small valid guide: one question, one finding with a cause, one hand-off. */
function guideContent(ask: string, finding: { title: string; code: string; cause: string; remedy: string }) {
  return {
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
      { kind: 'finding', id: 'found', title: finding.title, ...bare, causeCode: finding.code, cause: finding.cause, remedy: [finding.remedy], parts: [] },
      { kind: 'handoff', id: 'call', title: 'Call the application engineer', ...bare, contact: 'Application engineer', message: 'Say which checks you made.' },
    ],
  };
}

async function createArticle(title: string, texts: string[], extra: { summary?: string; tags?: string[]; keywords?: string[] } = {}) {
  const res = await author.post('/api/articles').send({ title, summary: extra.summary ?? '', body: doc(...texts), tags: extra.tags ?? [], keywords: extra.keywords ?? [] });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.article.id as number;
}

async function publishArticle(...args: Parameters<typeof createArticle>) {
  const id = await createArticle(...args);
  await author.post(`/api/articles/${id}/submit`).expect(200);
  await reviewer.post(`/api/articles/${id}/approve`).send({}).expect(200);
  return id;
}

async function createGuide(meta: { title: string; symptom: string; summary?: string; tags?: string[] }, content: unknown) {
  const res = await author.post('/api/guides').send({ summary: '', tags: [], ...meta, content });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.guide as Json;
}

async function publishGuide(meta: Parameters<typeof createGuide>[0], content: unknown) {
  const g = await createGuide(meta, content);
  const sub = await author.post(`/api/guides/${g.id}/submit`).send({});
  expect(sub.status, JSON.stringify(sub.body)).toBe(200);
  await reviewer.post(`/api/guides/${g.id}/approve`).send({}).expect(200);
  return g.id as number;
}

async function search(agent: Agent, params: Record<string, string>) {
  return agent.get('/api/search').query(params);
}

async function top(q: string, agent = tech) {
  const res = await search(agent, { q });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.results[0] as Json | undefined;
}

const ids: Record<string, number> = {};

beforeAll(async () => {
  t = await startTestApp();
  author = (await t.signIn(['author'])).agent;
  reviewer = (await t.signIn(['author'])).agent;
  tech = (await t.signIn(['technician'])).agent;
  admin = (await t.signIn(['admin'])).agent;

  ids.drips = await publishGuide(
    { title: 'Drips after the valve closes (electric valve)', symptom: 'Drips after the valve closes', tags: ['electric', 'seat', 'needle'] },
    guideContent('Does a drop form at the nozzle tip within a second of the shot ending?', {
      title: 'Debris on the seat',
      code: 'seat-debris',
      cause: 'Cured adhesive on the seat keeps the needle from sealing.',
      remedy: 'Clean the seat and the needle tip with the solvent named on the data sheet.',
    }),
  );
  ids.weep = await publishGuide(
    { title: 'Seal weep on an air-operated valve', symptom: 'Fluid at the weep hole or around the body', tags: ['air-operated', 'dynamic-seals'] },
    guideContent('Is there fluid on the air side of the piston?', {
      title: 'Worn shaft seal',
      code: 'dynamic-seal-worn',
      cause: 'The dynamic seal on the needle shaft is worn and lets fluid past.',
      remedy: 'Fit a new seal kit and check the shaft for scoring.',
    }),
  );
  ids.coil = await publishGuide(
    { title: 'Coil runs hot on a solenoid valve', symptom: 'Coil too hot to touch after an hour of running', tags: ['electric', 'coil', 'driver'] },
    guideContent('Does the driver drop from spike to hold voltage after opening?', {
      title: 'Coil held at spike voltage',
      code: 'coil-overheating',
      cause: 'The driver never drops to the hold voltage, so the coil heats up.',
      remedy: 'Set the hold voltage on the driver and check the duty cycle.',
    }),
  );
  ids.drift = await publishGuide(
    { title: 'Shot size drifts through the shift', symptom: 'Dots get smaller or larger over the shift', tags: ['supply-regulator'] },
    guideContent('Does the inlet gauge move while the line runs?', {
      title: 'Regulator drifting',
      code: 'regulator-drift',
      cause: 'The supply regulator does not hold its set pressure.',
      remedy: 'Replace the regulator diaphragm or the regulator.',
    }),
  );
  ids.strings = await publishGuide(
    { title: 'Hot melt strings and tails between parts', symptom: 'Glue strings, tails or spitting at the nozzle', tags: ['hot-melt', 'nozzle', 'heater-hose'] },
    guideContent('Is the nozzle temperature above the adhesive maker’s range?', {
      title: 'Nozzle too hot',
      code: 'temperature-wrong',
      cause: 'The heated nozzle runs hotter than the hot melt needs.',
      remedy: 'Lower the nozzle set point in steps of five degrees.',
    }),
  );
  ids.noflow = await publishGuide(
    { title: 'No flow when the valve fires', symptom: 'Valve clicks but nothing comes out', tags: ['electric', 'coil', 'nozzle'] },
    guideContent('Can you hear the plunger move when the shot signal comes?', {
      title: 'Nozzle blocked',
      code: 'nozzle-blocked',
      cause: 'Cured material blocks the nozzle bore.',
      remedy: 'Soak the nozzle in solvent and clear it with a probe.',
    }),
  );

  ids.loupe = await publishArticle('Reading a worn seat under a loupe', ['A good stainless seat shows a thin, bright contact ring.', 'A wide, frosted band all round means the seat is worn.'], {
    summary: 'Tell debris from wear before ordering a seat.',
    tags: ['seat'],
    keywords: ['loupe'],
  });
  ids.lipseal = await publishArticle(
    'Choosing O-rings or spring-energised PTFE lip seals',
    ['Lip seals seal harder as pressure rises.', 'Swelling shows a seal material that does not suit the fluid: check the compatibility chart.'],
    {
      tags: ['dynamic-seals', 'cyanoacrylate'],
    },
  );
  ids.spike = await publishArticle(
    'Spike and hold drivers for high-voltage coils',
    ['The driver opens the valve with a short spike near 170 V DC, then drops to a lower hold voltage.', 'Without the drop to hold, the coil runs hot.'],
    {
      tags: ['driver', 'coil', 'electric'],
    },
  );
  ids.purge = await publishArticle('Purging trapped air from a cold glue line', ['Air bubbles in the bead come from air trapped in the line.', 'Purge into a waste cup until the stream runs clear.'], {
    tags: ['cold-glue'],
  });
  ids.tank = await publishArticle(
    'Setting hot melt tank and hose temperatures',
    ['Tank, heated hose and valve are usually set between 120 and 200 degrees C.', 'Set the hose a little above the tank.'],
    {
      tags: ['hot-melt', 'heater-hose'],
    },
  );
  ids.epoxy = await publishArticle(
    'Viscosity of two-part epoxy near the end of its pot life',
    ['Two-part epoxy thickens as it cures in the mixer.', 'Purge the static mixer before the pot life runs out.'],
    {
      tags: ['epoxy'],
    },
  );
  await syncSearch(t.db);
});
afterAll(async () => t?.close());

describe('relevance with the PostgreSQL engine', () => {
  const cases: [string, string, string][] = [
    ['drips after the valve closes', 'drips', 'the symptom in the technician’s words'],
    ['drool', 'drips', 'a synonym of drip'],
    ['dribble after close', 'drips', 'a synonym with another word'],
    ['gun drips', 'drips', 'gun = valve'],
    ['vàlve drïps', 'drips', 'accents ignored'],
    ['dripps', 'drips', 'a misspelling'],
    ['drips after shutoff', 'drips', 'one word nobody used'],
    ['weep hole', 'weep', 'the weep hole'],
    ['seep', 'weep', 'seep = weep'],
    ['leak around the body', 'weep', 'leak = weep'],
    ['"weep hole" -coil', 'weep', 'quotes and minus'],
    ['selenoid hot', 'coil', 'solenoid misspelt'],
    ['coil hot', 'coil', 'a symptom-like query prefers the guide'],
    ['deposit gets smaller', 'drift', 'deposit = dot'],
    ['shot size drift', 'drift', 'title words'],
    ['glue string', 'strings', 'stringing'],
    ['stringing hot melt', 'strings', 'stemming'],
    ['nothing comes out', 'noflow', 'symptom'],
    ['loupe', 'loupe', 'an article keyword'],
    ['frosted band', 'loupe', 'words only in an article’s body'],
    ['lip seal swelling', 'lipseal', 'article title and body'],
    ['spike and hold driver', 'spike', 'article title'],
    ['purge air bubbles', 'purge', 'article body'],
    ['epoxy pot life', 'epoxy', 'article title'],
  ];
  for (const [q, expected, why] of cases) {
    it(`when a technician searches "${q}" (${why}), then the top result is the ${expected} item`, async () => {
      const first = await top(q);
      expect(first, `no result for ${q}`).toBeTruthy();
      expect({ kind: first!.kind, id: first!.id }).toEqual({ kind: ['loupe', 'lipseal', 'spike', 'purge', 'tank', 'epoxy'].includes(expected) ? 'article' : 'guide', id: ids[expected] });
    });
  }

  it('when a symptom-like query also matches articles, then guides come first and the answer says so', async () => {
    const res = await search(tech, { q: 'coil hot' });
    expect(res.body.guidesFirst).toBe(true);
    const kinds = res.body.results.map((r: Json) => r.kind);
    expect(kinds).toContain('article');
    expect(kinds.indexOf('article')).toBeGreaterThan(kinds.lastIndexOf('guide'));
  });

  it('when words are found, then title and snippet mark them with <mark> and nothing else', async () => {
    const res = await search(tech, { q: 'frosted band' });
    const hit = res.body.results[0];
    expect(hit.snippetHtml).toMatch(/<mark>frosted<\/mark>/i);
    expect(hit.snippetHtml.replace(/<\/?mark>/g, '')).not.toMatch(/[<>]/);
    expect(res.headers['x-search-engine']).toBe('postgres');
    expect(res.body).toMatchObject({ engine: 'postgres', fallback: false });
  });

  it('when a misspelt query is corrected, then the answer says how it was read', async () => {
    const res = await search(tech, { q: 'selenoid' });
    expect(res.body.corrected).toBe('solenoid');
    expect(res.body.results[0]).toMatchObject({ kind: 'guide', id: ids.coil });
  });

  it('when filters are given, then only items with those tags come back', async () => {
    const res = await search(tech, { q: 'coil', actuation: 'electric', component: 'driver' });
    expect(res.status).toBe(200);
    const found = res.body.results.map((r: Json) => r.id);
    expect(found).toEqual(expect.arrayContaining([ids.coil, ids.spike]));
    for (const r of res.body.results) expect(r.tags).toEqual(expect.arrayContaining(['electric', 'driver']));
    const hotMelt = await search(tech, { q: '', fluid: 'hot-melt' });
    expect(hotMelt.body.results.map((r: Json) => r.id).sort()).toEqual([ids.strings, ids.tank].sort());
    const articlesOnly = await search(tech, { q: 'coil', kind: 'article' });
    expect(articlesOnly.body.results.every((r: Json) => r.kind === 'article')).toBe(true);
  });

  it('when nothing matches, then the answer is empty with suggestions to try', async () => {
    const res = await search(tech, { q: 'xylophone quartet' });
    expect(res.status).toBe(200);
    expect(res.body.results).toEqual([]);
    expect(res.body.suggestions.length).toBeGreaterThan(0);
  });
});

describe('synonyms edited by an admin', () => {
  it('when an admin adds a group, then both engines’ PostgreSQL side applies it at once; a technician may not edit it', async () => {
    const before = await admin.get('/api/admin/search/synonyms');
    expect(before.status).toBe(200);
    expect(before.body.groups).toEqual(
      expect.arrayContaining([
        ['drip', 'drool', 'dribble'],
        ['gun', 'valve', 'applicator'],
      ]),
    );
    expect(await top('cobweb')).toBeUndefined();
    const put = await admin.put('/api/admin/search/synonyms').send({ groups: [...before.body.groups.map((terms: string[]) => ({ terms })), { terms: ['string', 'Cobweb'] }] });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    expect(put.body.groups).toContainEqual(['string', 'cobweb']);
    expect(await top('cobweb')).toMatchObject({ kind: 'guide', id: ids.strings });
    expect((await tech.put('/api/admin/search/synonyms').send({ groups: [] })).status).toBe(403);
  });

  it('when a group has one word or odd characters, then it is refused with the field named', async () => {
    const one = await admin.put('/api/admin/search/synonyms').send({ groups: [{ terms: ['drip'] }] });
    expect(one.status).toBe(400);
    expect(one.body.error.fields['groups.0.terms']).toMatch(/two/);
    const odd = await admin.put('/api/admin/search/synonyms').send({ groups: [{ terms: ['drip', "x' | 'y"] }] });
    expect(odd.status).toBe(400);
    expect(Object.keys(odd.body.error.fields)).toContain('groups.0.terms.1');
  });
});

describe('only published content, for everyone', () => {
  const roles: Role[] = ['technician', 'support', 'manager', 'author', 'admin'];

  it('when items are drafts, in review, archived, retired or another organisation’s, then no role ever finds them', async () => {
    await createArticle('Zanthorium draft about seats', ['zanthorium is only in a draft']);
    const inReview = await createArticle('Quorvelite seat notes', ['quorvelite is only in review']);
    await author.post(`/api/articles/${inReview}/submit`).expect(200);
    const archived = await publishArticle('Blemmorite article', ['blemmorite was published once']);
    await author.post(`/api/articles/${archived}/archive`).expect(200);
    await createGuide({ title: 'Frindlemoss draft guide', symptom: 'frindlemoss symptom' }, guideContent('Is it frindlemoss?', { title: 'F', code: 'other', cause: 'c', remedy: 'r' }));
    const retired = await publishGuide({ title: 'Plonkwhistle guide', symptom: 'plonkwhistle symptom' }, guideContent('Is it plonkwhistle?', { title: 'P', code: 'other', cause: 'c', remedy: 'r' }));
    await author.post(`/api/guides/${retired}/retire`).expect(200);
    // A published guide whose new draft says something the published version does not.
    const g = await author.post(`/api/guides/${ids.noflow}/draft`);
    expect(g.status, JSON.stringify(g.body)).toBe(201);
    const draft = g.body.guide.draft;
    await author
      .put(`/api/guides/${ids.noflow}/draft`)
      .send({ meta: { ...draft.meta, title: 'No flow gribbleflux' }, content: draft.content, baseLockVersion: g.body.guide.lockVersion })
      .expect(200);
    // Another organisation's published article, inserted as its own rows.
    const [org] = await t.db('organisations').insert({ name: 'Other works' }).returning('id');
    const [a] = await t.db('articles').insert({ organisation_id: org.id, slug: 'snorkelbane', workflow: 'published' }).returning('id');
    const [r] = await t
      .db('article_revisions')
      .insert({ article_id: a.id, number: 1, title: 'Snorkelbane seats', body_json: JSON.stringify(doc('snorkelbane')), body_html: '<p>snorkelbane</p>', body_text: 'snorkelbane' })
      .returning('id');
    await t.db('articles').where({ id: a.id }).update({ head_revision_id: r.id, published_revision_id: r.id });
    await syncSearch(t.db);
    expect((await t.db('search_documents').where({ ref_id: a.id, kind: 'article' })).length, 'the other organisation’s article is indexed').toBe(1);

    for (const role of roles) {
      const agent = role === 'technician' ? tech : (await t.signIn([role])).agent;
      for (const word of ['zanthorium', 'quorvelite', 'blemmorite', 'frindlemoss', 'plonkwhistle', 'gribbleflux', 'snorkelbane']) {
        const res = await search(agent, { q: word });
        expect(res.status, `${role} ${word}`).toBe(200);
        expect(res.body.results, `${role} found ${word}`).toEqual([]);
        expect(JSON.stringify([res.body.suggestions, res.body.corrected]), `${role} saw ${word} in suggestions`).not.toContain(word);
      }
    }
    // The published version of the guide with a draft is still found, under its published title.
    expect(await top('nothing comes out')).toMatchObject({ id: ids.noflow, title: 'No flow when the valve fires' });
  });

  it('when content is published, archived, restored, retired and restored, then search follows within one sync', async () => {
    const word = 'vexillock';
    const id = await publishArticle(`Vexillock seat tool`, ['How to use the vexillock tool.'], { tags: ['seat'] });
    await syncSearch(t.db);
    expect(await top(word)).toMatchObject({ kind: 'article', id });
    await author.post(`/api/articles/${id}/archive`).expect(200);
    await syncSearch(t.db);
    expect(await top(word)).toBeUndefined();
    await author.post(`/api/articles/${id}/unarchive`).expect(200);
    await syncSearch(t.db);
    expect(await top(word)).toMatchObject({ kind: 'article', id });

    await author.post(`/api/guides/${ids.weep}/retire`).expect(200);
    await syncSearch(t.db);
    expect((await search(tech, { q: 'weep hole' })).body.results.map((r: Json) => r.id)).not.toContain(ids.weep);
    await author.post(`/api/guides/${ids.weep}/restore`).expect(200);
    await syncSearch(t.db);
    expect(await top('weep hole')).toMatchObject({ id: ids.weep });
  });

  it('when a source row is deleted outright, then its document goes too', async () => {
    const id = await publishArticle('Quillotrope nozzle note', ['quillotrope']);
    await syncSearch(t.db);
    expect(await top('quillotrope')).toMatchObject({ id });
    await t.db('article_events').where({ article_id: id }).delete();
    await t.db('articles').where({ id }).update({ head_revision_id: null, published_revision_id: null });
    await t.db('article_revisions').where({ article_id: id }).delete();
    await t.db('articles').where({ id }).delete();
    await syncSearch(t.db);
    expect(await top('quillotrope')).toBeUndefined();
  });

  it('when the in-process job runs on its own, then a newly published article is found within a few seconds', async () => {
    const id = await publishArticle('Wobbleton dispensing note', ['wobbleton']);
    const deadline = Date.now() + 8000;
    let found: Json | undefined;
    while (!found && Date.now() < deadline) {
      found = await top('wobbleton');
      if (!found) await new Promise((r) => setTimeout(r, 200));
    }
    expect(found).toMatchObject({ id });
  });
});

describe('odd input', () => {
  const sensible: [string, string][] = [
    ['only stop words', 'the of and at'],
    ['only punctuation', '?!.,;:-—…'],
    ['tsquery operators', `&|!():*'`],
    ['operators around words', "seat & | !needle:* ('drip"],
    ['SQL', "'; drop table articles; --"],
    ['a lone quote', '"'],
    ['a lone minus', '-'],
    ['emoji and symbols', '💧💧 ⟦mark⟧ <script>alert(1)</script>'],
  ];
  for (const [what, q] of sensible) {
    it(`when the query is ${what}, then the answer is a normal 200`, async () => {
      const res = await search(tech, { q });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      expect(Array.isArray(res.body.results)).toBe(true);
      expect(JSON.stringify(res.body.results)).not.toContain('<script>');
    });
  }

  it('when the query is empty, then there are no results and no error', async () => {
    const res = await search(tech, { q: '' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ results: [], total: 0 });
    expect((await tech.get('/api/search')).status).toBe(200);
  });

  it('when the query is 5,000 characters, then it is refused with the field named', async () => {
    const res = await search(tech, { q: 'drip '.repeat(1000) });
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: 'invalid_input' });
    expect(res.body.error.fields.q).toMatch(/200 characters/);
  });

  const refused: [string, Record<string, string> | string, string][] = [
    ['an unknown actuation', { q: 'drip', actuation: 'hydraulic' }, 'actuation'],
    ['a tag of another group', { q: 'drip', fluid: 'electric' }, 'fluid'],
    ['a malformed component', { q: 'drip', component: 'Seat & Needle' }, 'component'],
    ['an unknown kind', { q: 'drip', kind: 'video' }, 'kind'],
    ['a limit of zero', { q: 'drip', limit: '0' }, 'limit'],
    ['a limit that is not a number', { q: 'drip', limit: 'lots' }, 'limit'],
    ['two q parameters', 'q=drip&q=weep', 'q'],
  ];
  for (const [what, params, field] of refused) {
    it(`when the request has ${what}, then it is a 400 naming ${field}`, async () => {
      const res = typeof params === 'string' ? await tech.get(`/api/search?${params}`) : await search(tech, params);
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(res.body.error.code).toBe('invalid_input');
      expect(Object.keys(res.body.error.fields)).toContain(field);
    });
  }

  it('when nobody is signed in, then search is refused', async () => {
    expect((await t.agent().get('/api/search?q=drip')).status).toBe(401);
  });
});

describe('the admin page’s data', () => {
  it('when an admin asks, then the engine, document counts, sync time and queue are reported; a rebuild queues everything', async () => {
    const res = await admin.get('/api/admin/search');
    expect(res.status).toBe(200);
    const s = res.body.status;
    expect(s).toMatchObject({ configured: 'postgres', answering: 'postgres', meili: null });
    expect(s.postgres.guides).toBeGreaterThanOrEqual(6);
    expect(s.postgres.articles).toBeGreaterThanOrEqual(6);
    expect(s.postgres.words).toBeGreaterThan(10);
    expect(s.lastSyncAt).toBeTruthy();
    expect(s.jobs).toEqual([expect.objectContaining({ target: 'postgres', failed: 0 })]);
    const re = await admin.post('/api/admin/search/reindex');
    expect(re.status).toBe(202);
    expect(re.body.queued).toBeGreaterThanOrEqual(12);
    await syncSearch(t.db);
    expect((await admin.get('/api/admin/search')).body.status.jobs[0].pending).toBe(0);
    expect(await top('loupe')).toMatchObject({ id: ids.loupe });
    expect((await tech.get('/api/admin/search')).status).toBe(403);
  });
});
