// Guides over HTTP: drafting, validation that blocks submit, review by a second author, published
// versions that never change, optimistic locking, retiring, comparing versions, limits, and what
// technicians can and cannot see.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { GuideContent } from '../../src/shared/guides/schema';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let author: Agent;
let reviewer: Agent;
let tech: Agent;
let techUserId: number;

beforeAll(async () => {
  t = await startTestApp();
  author = (await t.signIn(['author'])).agent;
  reviewer = (await t.signIn(['author'])).agent;
  const signedTech = await t.signIn(['technician']);
  tech = signedTech.agent;
  techUserId = signedTech.user.id;
});
afterAll(async () => t?.close());

type Json = Record<string, any>;
const sample = (): GuideContent => structuredClone(SAMPLE_GUIDE);
const indexOf = (content: GuideContent, id: string) => content.steps.findIndex((s) => s.id === id);
const stepOf = (content: GuideContent, id: string): Json => content.steps[indexOf(content, id)] as Json;
let n = 0;
const meta = (title = `${SAMPLE_GUIDE_META.title} ${++n}`) => ({ ...SAMPLE_GUIDE_META, title });

async function create(content: unknown = sample(), m = meta()): Promise<Json> {
  const res = await author.post('/api/guides').send({ ...m, content });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.guide;
}

async function save(agent: Agent, g: Json, content: unknown, m: Json = g.draft?.meta ?? g.published.meta) {
  return agent.put(`/api/guides/${g.id}/draft`).send({ meta: m, content, baseLockVersion: g.lockVersion });
}

async function publish(g: Json): Promise<Json> {
  const sub = await author.post(`/api/guides/${g.id}/submit`).send({});
  expect(sub.status, JSON.stringify(sub.body)).toBe(200);
  const ok = await reviewer.post(`/api/guides/${g.id}/approve`).send({});
  expect(ok.status, JSON.stringify(ok.body)).toBe(200);
  return ok.body.guide;
}

async function versionRows(guideId: number) {
  return t.db('guide_versions').where({ guide_id: guideId }).orderBy('number').select('*', t.db.raw('content::text as content_text'));
}

describe('writing and publishing a guide', () => {
  it('when an author creates a guide with only a title and symptom, then it is a draft with one empty Ask step that validation flags', async () => {
    const res = await author.post('/api/guides').send({ title: '  Nozzle strings after close  ', symptom: 'Strings of fluid between shots' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const g = res.body.guide;
    expect(g).toMatchObject({ status: 'active', draftState: 'draft', lockVersion: 1, published: null });
    expect(g.draft.meta).toEqual({ title: 'Nozzle strings after close', symptom: 'Strings of fluid between shots', summary: '', tags: [] });
    expect(g.draft.content.steps).toHaveLength(1);
    expect(g.draft.content.steps[0]).toMatchObject({ kind: 'ask', title: 'Strings of fluid between shots' });
    expect(g.draft.validation.errors.map((e: Json) => e.code)).toContain('no-branches');
    expect(g.versions).toEqual([expect.objectContaining({ number: 1, state: 'draft', publishedAt: null })]);
    expect(g.events[0]).toMatchObject({ kind: 'created', versionNumber: 1 });

    const list = (await author.get('/api/guides')).body.guides as Json[];
    const item = list.find((x) => x.id === g.id)!;
    expect(item).toMatchObject({ draftState: 'draft', publishedVersion: null, draftVersion: 1, openFlagCount: 0, walksNotFixed: 0 });
    expect(item.errorCount).toBeGreaterThan(0);
    expect(item.draftUpdatedByName).toBeTruthy();
  });

  it('when the draft has errors, then submit is refused with each problem at its path; once fixed it is submitted, approved by another author and published', async () => {
    const broken = sample();
    const pressure = stepOf(broken, 'fluid-pressure');
    pressure.bands[1].min = 6; // a gap between 5.5 and 6 bar
    stepOf(broken, 'drip-when').choices[1].next = 'clean-the-seat'; // no such step
    const g = await create(broken);
    expect(g.draft.errorCount).toBe(2);

    const refused = await author.post(`/api/guides/${g.id}/submit`).send({});
    expect(refused.status).toBe(400);
    expect(refused.body.error.code).toBe('invalid_input');
    expect(refused.body.error.message).toMatch(/2 problems/);
    const p = indexOf(broken, 'fluid-pressure');
    const d = indexOf(broken, 'drip-when');
    expect(refused.body.error.fields[`content.steps[${p}].bands[1].min`]).toMatch(/Gap/);
    expect(refused.body.error.fields[`content.steps[${d}].choices[1].next`]).toMatch(/'drip-when'.*'clean-the-seat'.*does not exist/);
    expect((await author.get(`/api/guides/${g.id}`)).body.guide.draftState).toBe('draft');

    const fixed = await save(author, g, sample());
    expect(fixed.status, JSON.stringify(fixed.body)).toBe(200);
    expect(fixed.body.guide.draft.validation.errors).toEqual([]);
    expect(fixed.body.guide.lockVersion).toBe(g.lockVersion + 1);

    const sub = await author.post(`/api/guides/${g.id}/submit`).send({ baseLockVersion: fixed.body.guide.lockVersion });
    expect(sub.status, JSON.stringify(sub.body)).toBe(200);
    expect(sub.body.guide.draftState).toBe('in_review');
    expect((await reviewer.get('/api/guides?status=review-queue')).body.guides.map((x: Json) => x.id)).toContain(g.id);
    expect((await author.get('/api/guides?status=review-queue')).body.guides.map((x: Json) => x.id)).not.toContain(g.id);

    const self = await author.post(`/api/guides/${g.id}/approve`).send({});
    expect(self.status).toBe(403);
    expect(self.body.error.message).toMatch(/different author/);

    const ok = await reviewer.post(`/api/guides/${g.id}/approve`).send({ comment: 'Checked against the service manual' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const pub = ok.body.guide;
    expect(pub).toMatchObject({ draftState: 'none', draft: null });
    expect(pub.published).toMatchObject({ number: 1, state: 'published', reviewComment: 'Checked against the service manual' });
    expect(pub.published.publishedAt).toBeTruthy();
    expect(pub.events.map((e: Json) => e.kind).slice(0, 2)).toEqual(['approved', 'submitted']);
    const row = await t.db('guides').where({ id: g.id }).first();
    expect(row.draft_version_id).toBeNull();
    expect(row.published_version_id).toBe((await versionRows(g.id))[0].id);
  });

  it('when a step body is saved, then its html is rebuilt from the document and never taken from the client', async () => {
    const content = sample();
    stepOf(content, 'drip-when').body = {
      doc: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Watch ten shots', marks: [{ type: 'link', attrs: { href: 'javascript:alert(1)' } }] }] }] },
      html: '<img src=x onerror=alert(1)>',
    };
    const g = await create(content);
    const body = stepOf(g.draft.content, 'drip-when').body;
    expect(body.html).toContain('Watch ten shots');
    expect(body.html).not.toMatch(/onerror|javascript:|<img/);
  });

  it("when a tag is unknown or a photo is not one of the organisation's, then 400 names it and nothing is stored", async () => {
    let before = Number((await t.db('guides').count('* as c').first())!.c);
    const tag = await author.post('/api/guides').send({ ...meta(), tags: ['seat', 'flux-capacitor'] });
    expect(tag.status).toBe(400);
    expect(tag.body.error.fields.tags).toMatch(/flux-capacitor/);
    const g = await create();
    const renamed = await save(author, g, sample(), { ...g.draft.meta, tags: ['flux-capacitor'] });
    expect(renamed.status).toBe(400);
    expect(renamed.body.error.fields['meta.tags']).toMatch(/flux-capacitor/);
    before += 1;
    const content = sample();
    content.steps[0].photoIds = ['0b7e9f0c-1111-4222-8333-444455556666'];
    const photo = await author.post('/api/guides').send({ ...meta(), content });
    expect(photo.status).toBe(400);
    expect(photo.body.error.fields['content.steps[0].photoIds[0]']).toMatch(/Step 1 \('drip-when'\).*not found/);
    expect(Number((await t.db('guides').count('* as c').first())!.c)).toBe(before);
  });
});

describe('self-publishing', () => {
  it('when the organisation allows self-publishing, then the submitting author may approve their own guide', async () => {
    const other = await startTestApp();
    try {
      const { agent: a } = await other.signIn(['admin']);
      const { agent: solo } = await other.signIn(['author']);
      const g = (await solo.post('/api/guides').send({ ...meta(), content: sample() })).body.guide;
      await solo.post(`/api/guides/${g.id}/submit`).send({}).expect(200);
      expect((await solo.post(`/api/guides/${g.id}/approve`).send({})).status).toBe(403);
      await a.patch('/api/admin/settings').send({ allowSelfPublish: true }).expect(200);
      const ok = await solo.post(`/api/guides/${g.id}/approve`).send({});
      expect(ok.status, JSON.stringify(ok.body)).toBe(200);
      expect(ok.body.guide.published.number).toBe(1);
    } finally {
      await other.close();
    }
  });
});

describe('published versions and drafts', () => {
  it('when a technician opens or lists guides, then only the published version of active guides shows, never a draft', async () => {
    const unpublished = await create();
    const g = await publish(await create());
    const draft = await save(author, { ...g, draft: null }, sample(), { ...g.published.meta, title: 'Drips: new and unreviewed' });
    expect(draft.status, JSON.stringify(draft.body)).toBe(200);

    const read = await tech.get(`/api/guides/${g.id}`);
    expect(read.status).toBe(200);
    expect(read.body.guide.published.meta.title).toBe(g.published.meta.title);
    expect(read.body.guide).toMatchObject({ draft: null, draftState: null, lockVersion: null, versions: [], events: [], flags: {} });
    expect(JSON.stringify(read.body)).not.toContain('new and unreviewed');
    expect((await tech.get(`/api/guides/${unpublished.id}`)).status).toBe(404);

    const list = (await tech.get('/api/guides')).body.guides as Json[];
    expect(list.map((x) => x.id)).toContain(g.id);
    expect(list.map((x) => x.id)).not.toContain(unpublished.id);
    expect(list.find((x) => x.id === g.id)).toMatchObject({ title: g.published.meta.title, draftState: 'none', errorCount: null, lockVersion: null });

    const authorView = (await author.get('/api/guides')).body.guides.find((x: Json) => x.id === g.id);
    expect(authorView).toMatchObject({ title: 'Drips: new and unreviewed', draftState: 'draft', publishedVersion: 1, draftVersion: 2 });
  });

  it('when a new draft is started from a published version and edited, then the published row stays byte for byte the same', async () => {
    const g = await publish(await create());
    const [before] = await versionRows(g.id);

    const started = await author.post(`/api/guides/${g.id}/draft`).send({});
    expect(started.status, JSON.stringify(started.body)).toBe(201);
    expect(started.body.guide.draft).toMatchObject({ number: 2, state: 'draft' });
    expect(started.body.guide.draft.content).toEqual(g.published.content);
    expect((await author.post(`/api/guides/${g.id}/draft`).send({})).status).toBe(409);

    const changed = sample();
    stepOf(changed, 'purge-air').title = 'Purge the air until it runs clear of bubbles';
    const saved = await save(author, started.body.guide, changed);
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);

    const [after, draft] = await versionRows(g.id);
    expect(after).toEqual(before);
    expect(draft.content_text).toContain('until it runs clear of bubbles');
    expect(after.content_text).not.toContain('until it runs clear of bubbles');

    // Publishing the draft only marks the old version superseded; its text and times stay.
    await publish(saved.body.guide);
    const [old, current] = await versionRows(g.id);
    expect(old.state).toBe('superseded');
    expect({ ...old, state: 'published' }).toEqual(before);
    expect(current.state).toBe('published');
  });

  it('when the published guide has no draft and an author saves, then the save becomes the next version', async () => {
    const g = await publish(await create());
    const saved = await save(author, { ...g, draft: null }, sample());
    expect(saved.status).toBe(200);
    expect(saved.body.guide.draft.number).toBe(2);
    expect(saved.body.guide.published.number).toBe(1);
    expect(saved.body.guide.events[0]).toMatchObject({ kind: 'draft_started', versionNumber: 2 });
  });

  it('when a draft is discarded, then the published version is what remains; a never-published draft cannot be discarded', async () => {
    const g = await publish(await create());
    const started = (await author.post(`/api/guides/${g.id}/draft`).send({})).body.guide;
    const stale = await author.delete(`/api/guides/${g.id}/draft?baseLockVersion=${started.lockVersion - 1}`);
    expect(stale.status).toBe(409);
    const gone = await author.delete(`/api/guides/${g.id}/draft?baseLockVersion=${started.lockVersion}`);
    expect(gone.status, JSON.stringify(gone.body)).toBe(200);
    expect(gone.body.guide).toMatchObject({ draftState: 'none', draft: null });
    expect((await versionRows(g.id)).map((v) => v.state)).toEqual(['published']);
    // The discarded number is not given to different content.
    expect((await author.post(`/api/guides/${g.id}/draft`).send({})).body.guide.draft.number).toBe(3);

    const fresh = await create();
    const refused = await author.delete(`/api/guides/${fresh.id}/draft`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/never been published/);
  });

  it('when a version is asked for by number, then authors get its meta and content; a missing number is 404', async () => {
    const g = await publish(await create());
    const v = await author.get(`/api/guides/${g.id}/versions/1`);
    expect(v.status).toBe(200);
    expect(v.body.version).toMatchObject({ number: 1, state: 'published', meta: g.published.meta });
    expect(v.body.version.content.startStepId).toBe(SAMPLE_GUIDE.startStepId);
    expect((await author.get(`/api/guides/${g.id}/versions/7`)).status).toBe(404);
    expect((await tech.get(`/api/guides/${g.id}/versions/1`)).status).toBe(403);
  });
});

describe('no lost work', () => {
  it('when two authors save from the same lock version, then the second gets 409 with the current draft and nothing is overwritten', async () => {
    const g = await create();
    const mine = sample();
    stepOf(mine, 'drip-when').title = 'Author one: when does it drip?';
    const theirs = sample();
    stepOf(theirs, 'drip-when').title = 'Author two: when does it drip?';

    const first = await save(author, g, mine);
    expect(first.status).toBe(200);
    const second = await save(reviewer, g, theirs);
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('conflict');
    expect(second.body.error.message).toMatch(/Someone else changed this guide/);
    expect(second.body.error.details.current.lockVersion).toBe(first.body.guide.lockVersion);
    expect(stepOf(second.body.error.details.current.draft.content, 'drip-when').title).toBe('Author one: when does it drip?');

    const [row] = await versionRows(g.id);
    expect(row.content_text).toContain('Author one');
    expect(row.content_text).not.toContain('Author two');
  });

  it('when the draft is waiting for review, then saving is refused until it is withdrawn', async () => {
    const g = await create();
    const sub = (await author.post(`/api/guides/${g.id}/submit`).send({})).body.guide;
    const refused = await save(author, sub, sample());
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/withdraw it from review first/);
    const back = await author.post(`/api/guides/${g.id}/withdraw`).send({});
    expect(back.body.guide.draftState).toBe('draft');
    expect((await save(author, back.body.guide, sample())).status).toBe(200);
  });

  it('when a reviewer sends the draft back, then a comment is required and it is a draft again with the comment kept', async () => {
    const g = await create();
    await author.post(`/api/guides/${g.id}/submit`).send({}).expect(200);
    const empty = await reviewer.post(`/api/guides/${g.id}/request-changes`).send({ comment: ' ' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.comment).toBeTruthy();
    const back = await reviewer.post(`/api/guides/${g.id}/request-changes`).send({ comment: 'Add the torque for the nozzle nut' });
    expect(back.status).toBe(200);
    expect(back.body.guide.draftState).toBe('draft');
    expect(back.body.guide.draft.reviewComment).toBe('Add the torque for the nozzle nut');
    expect(back.body.guide.events[0]).toMatchObject({ kind: 'changes_requested', comment: 'Add the torque for the nozzle nut' });
    expect((await reviewer.post(`/api/guides/${g.id}/approve`).send({})).status).toBe(409);
  });
});

describe('retiring', () => {
  it('when a guide is retired, then technicians no longer find it, authors still do, and restoring brings it back', async () => {
    const g = await publish(await create());
    const retired = await author.post(`/api/guides/${g.id}/retire`).send({});
    expect(retired.status).toBe(200);
    expect(retired.body.guide).toMatchObject({ status: 'retired' });
    expect(retired.body.guide.retiredAt).toBeTruthy();
    expect((await tech.get(`/api/guides/${g.id}`)).status).toBe(404);
    expect((await tech.get('/api/guides')).body.guides.map((x: Json) => x.id)).not.toContain(g.id);
    expect((await author.get('/api/guides?status=retired')).body.guides.map((x: Json) => x.id)).toContain(g.id);
    expect((await author.get('/api/guides?status=active')).body.guides.map((x: Json) => x.id)).not.toContain(g.id);
    expect((await author.post(`/api/guides/${g.id}/retire`).send({})).status).toBe(409);

    const back = await author.post(`/api/guides/${g.id}/restore`).send({});
    expect(back.body.guide.status).toBe('active');
    expect((await tech.get(`/api/guides/${g.id}`)).status).toBe(200);
  });
});

describe('comparing versions', () => {
  it('when the draft adds, removes and changes steps, then the comparison lists each by step id with the fields that changed', async () => {
    const g = await publish(await create());
    const next = sample();
    const ask = stepOf(next, 'drip-when');
    ask.title = 'When do you see fluid at the nozzle?';
    stepOf(next, 'fluid-pressure').bands[0].max = 6;
    stepOf(next, 'fluid-pressure').bands[1].min = 6;
    stepOf(next, 'purge-air').cautions = [];
    // 'short-nozzle' goes; 'check-heater' takes its place.
    const short = stepOf(next, 'short-nozzle');
    next.steps[indexOf(next, 'short-nozzle')] = { ...(short as any), id: 'check-heater', title: 'Check the heater set point' };
    stepOf(next, 'nozzle-temp').bands[0].next = 'check-heater';
    const saved = await save(author, { ...g, draft: null }, next, { ...g.published.meta, tags: ['electric', 'seat'] });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);

    const res = await author.get(`/api/guides/${g.id}/compare?from=published&to=draft`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const c = res.body.comparison;
    expect(c.from).toEqual({ number: 1, state: 'published' });
    expect(c.to).toEqual({ number: 2, state: 'draft' });
    expect(c.steps.added).toEqual([{ id: 'check-heater', kind: 'try', title: 'Check the heater set point' }]);
    expect(c.steps.removed.map((s: Json) => s.id)).toEqual(['short-nozzle']);
    const changed = Object.fromEntries(c.steps.changed.map((s: Json) => [s.id, s.fields]));
    expect(changed).toEqual({
      'drip-when': ['title'],
      'fluid-pressure': ['bands'],
      'purge-air': ['cautions'],
      'nozzle-temp': ['bands'],
    });
    expect(c.steps.unchanged).toBe(SAMPLE_GUIDE.steps.length - 5);
    expect(c.meta.tags.removed).toEqual(['needle', 'spring', 'coil', 'driver']);
    expect(c.meta.title).toBeUndefined();

    expect((await author.get(`/api/guides/${g.id}/compare?from=1&to=2`)).body.comparison.steps.changed).toHaveLength(4);
    expect((await author.get(`/api/guides/${g.id}/compare?from=1&to=9`)).status).toBe(404);
    expect((await author.get(`/api/guides/${g.id}/compare?from=first`)).status).toBe(400);
  });
});

describe('limits and bad input', () => {
  it('when a guide has 5,000 steps, then create and save are refused with a clear 400 and nothing is stored', async () => {
    const huge = {
      startStepId: 's0',
      steps: Array.from({ length: 5000 }, (_, i) => ({
        kind: 'try',
        id: `s${i}`,
        title: `Try ${i}`,
        cautions: [],
        photoIds: [],
        articleIds: [],
        action: 'Do it',
        fixedNext: null,
        notFixedNext: `s${i + 1}`,
      })),
    };
    const before = Number((await t.db('guides').count('* as c').first())!.c);
    const created = await author.post('/api/guides').send({ ...meta(), content: huge });
    expect(created.status).toBe(400);
    expect(created.body.error.message).toMatch(/5,000 steps; at most 300/);
    expect(created.body.error.fields['content.steps']).toMatch(/at most 300/);
    expect(Number((await t.db('guides').count('* as c').first())!.c)).toBe(before);

    const g = await create();
    const saved = await save(author, g, huge);
    expect(saved.status).toBe(400);
    const [row] = await versionRows(g.id);
    expect(row.content_text).not.toContain('"s4999"');
    expect((await author.get(`/api/guides/${g.id}`)).body.guide.lockVersion).toBe(g.lockVersion);
  });

  it('when a step breaks the draft limits, then 400 names the step and the field', async () => {
    const g = await create();
    const content = sample();
    const ask = stepOf(content, 'drip-when');
    ask.choices = Array.from({ length: 13 }, (_, i) => ({ id: `c${i}`, label: `Choice ${i}`, next: 'fluid-pressure' }));
    const res = await save(author, g, content);
    expect(res.status).toBe(400);
    const key = `content.steps[${indexOf(content, 'drip-when')}].choices`;
    expect(res.body.error.fields[key]).toMatch(/Step 1 \('drip-when'\): Choices: at most 12/);
  });

  it('when the guide id or version is not a number, or the guide does not exist, then 400 or 404', async () => {
    expect((await author.get('/api/guides/abc')).status).toBe(400);
    expect((await author.get('/api/guides/999999')).status).toBe(404);
    expect((await author.get('/api/guides/1/versions/x')).status).toBe(400);
    expect((await author.put('/api/guides/999999/draft').send({ meta: meta(), content: sample(), baseLockVersion: 1 })).status).toBe(404);
  });
});

describe('causes', () => {
  it('when the list is first read, then it holds the defaults; a replaced list turns the left-out causes inactive', async () => {
    const other = await startTestApp();
    try {
      const { agent: a } = await other.signIn(['admin']);
      const { agent: tch } = await other.signIn(['technician']);
      const first = await tch.get('/api/causes');
      expect(first.status).toBe(200);
      expect(first.body.causes.map((c: Json) => c.code)).toContain('seat-worn');

      const bad = await a.put('/api/causes').send({ causes: [{ code: 'Seat Worn', label: 'Seat worn' }] });
      expect(bad.status).toBe(400);
      expect(bad.body.error.fields['causes.0.code']).toMatch(/lower-case/);
      const twice = await a.put('/api/causes').send({
        causes: [
          { code: 'seat-worn', label: 'A' },
          { code: 'seat-worn', label: 'B' },
        ],
      });
      expect(twice.status).toBe(400);
      expect(twice.body.error.fields['causes.1.code']).toMatch(/twice/);
      expect((await tch.put('/api/causes').send({ causes: [{ code: 'x', label: 'x' }] })).status).toBe(403);

      const put = await a.put('/api/causes').send({
        causes: [
          { code: 'seat-worn', label: 'Seat worn out' },
          { code: 'nozzle-whisker', label: 'Whisker on the nozzle', component: 'nozzle' },
        ],
      });
      expect(put.status, JSON.stringify(put.body)).toBe(200);
      expect(put.body.causes.find((c: Json) => c.code === 'coil-open')).toMatchObject({ active: false });
      const active = (await tch.get('/api/causes')).body.causes;
      expect(active).toEqual([
        { code: 'seat-worn', label: 'Seat worn out', component: null, active: true },
        { code: 'nozzle-whisker', label: 'Whisker on the nozzle', component: 'nozzle', active: true },
      ]);
      expect((await tch.get('/api/causes?includeInactive=1')).body.causes.length).toBeGreaterThan(2);
    } finally {
      await other.close();
    }
  });

  it('when a finding uses a cause the organisation switched off, then the draft reports it and submit is refused', async () => {
    const other = await startTestApp();
    try {
      const { agent: a } = await other.signIn(['admin']);
      const { agent: writer } = await other.signIn(['author']);
      const g = (await writer.post('/api/guides').send({ ...meta(), content: sample() })).body.guide;
      expect(g.draft.validation.errors).toEqual([]);
      const keep = (await a.get('/api/causes')).body.causes.filter((c: Json) => c.code !== 'seat-worn');
      await a.put('/api/causes').send({ causes: keep }).expect(200);
      const now = (await writer.get(`/api/guides/${g.id}`)).body.guide;
      expect(now.draft.validation.errors.map((e: Json) => e.code)).toEqual(['cause-unknown']);
      const refused = await writer.post(`/api/guides/${g.id}/submit`).send({});
      expect(refused.status).toBe(400);
      expect(refused.body.error.fields[`content.steps[${indexOf(SAMPLE_GUIDE, 'finding-seat-worn')}].causeCode`]).toMatch(/seat-worn/);
    } finally {
      await other.close();
    }
  });
});

describe('what authors see of the field', () => {
  it('when technicians flag steps and walks end unfixed, then the list counts them and the guide groups open flags by step', async () => {
    const g = await publish(await create());
    const row = await t.db('guides').where({ id: g.id }).first();
    const base = { organisation_id: t.organisationId, guide_id: g.id, guide_version_id: row.published_version_id };
    const walk = (outcome: string) => ({ ...base, user_id: techUserId, status: 'ended', outcome, ended_at: new Date() });
    await t.db('walks').insert([walk('not-fixed'), walk('not-fixed'), walk('fixed-by-other'), walk('fixed')]);
    await t.db('step_flags').insert([
      { ...base, step_id: 'purge-air', user_id: techUserId, comment: 'The waste cup is not at the line' },
      { ...base, step_id: 'purge-air', user_id: techUserId, comment: 'Say how many shots' },
      { ...base, step_id: 'clean-seat', user_id: techUserId, comment: 'Old flag', resolved_at: new Date() },
    ]);

    const item = (await author.get('/api/guides')).body.guides.find((x: Json) => x.id === g.id);
    expect(item).toMatchObject({ openFlagCount: 2, walksNotFixed: 2, walksFixedByOther: 1 });
    const detail = (await author.get(`/api/guides/${g.id}`)).body.guide;
    expect(Object.keys(detail.flags)).toEqual(['purge-air']);
    expect(detail.flags['purge-air'].map((f: Json) => f.comment)).toEqual(['The waste cup is not at the line', 'Say how many shots']);
    expect(detail.flags['purge-air'][0]).toMatchObject({ stepId: 'purge-air', versionNumber: 1, userName: 'Test technician' });
    expect((await tech.get('/api/guides')).body.guides.find((x: Json) => x.id === g.id).openFlagCount).toBe(0);
  });

  it('when authors filter by tag, symptom or text, then only matching guides are listed', async () => {
    const g = await create(sample(), { title: `Coil runs hot ${++n}`, symptom: 'Coil too hot to touch', summary: 'Heat', tags: ['coil'] });
    const ids = async (q: string) => (await author.get(`/api/guides?${q}`)).body.guides.map((x: Json) => x.id);
    expect(await ids('tag=coil')).toContain(g.id);
    expect(await ids('tag=seat')).not.toContain(g.id);
    expect(await ids('symptom=too%20hot')).toContain(g.id);
    expect(await ids('q=runs%20hot')).toContain(g.id);
    expect(await ids('q=100%25')).not.toContain(g.id);
    expect((await author.get('/api/guides?status=nonsense')).status).toBe(400);
  });
});
