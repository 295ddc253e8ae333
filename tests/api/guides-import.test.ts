// The guide file over HTTP: export as a download, exact round trips through import, every problem
// of a bad file reported at its path with nothing stored, causes the organisation lacks added,
// and the exporting site's article and photo ids left behind.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { causesUsedBy, exportGuideFile, type GuideFile } from '../../src/shared/guides/export';
import type { GuideContent } from '../../src/shared/guides/schema';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import { DEFAULT_CAUSES } from '../../src/shared/tags';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let author: Agent;
let reviewer: Agent;

beforeAll(async () => {
  t = await startTestApp();
  author = (await t.signIn(['author'])).agent;
  reviewer = (await t.signIn(['author'])).agent;
});
afterAll(async () => t?.close());

type Json = Record<string, any>;
const sample = (): GuideContent => structuredClone(SAMPLE_GUIDE);
const indexOf = (content: { steps: { id: string }[] }, id: string) => content.steps.findIndex((s) => s.id === id);

function sampleFile(content: GuideContent = sample()): Json {
  const file = exportGuideFile({
    guide: { ...SAMPLE_GUIDE_META, causes: causesUsedBy(content, DEFAULT_CAUSES) },
    content,
    exportedAt: '2025-03-01T10:00:00.000Z',
  });
  return JSON.parse(JSON.stringify(file));
}

const guideCount = async () => Number((await t.db('guides').count('* as c').first())!.c);

async function exported(id: number, version = 'draft'): Promise<GuideFile> {
  const res = await author.get(`/api/guides/${id}/export?version=${version}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return JSON.parse(res.text);
}

describe('exporting and importing', () => {
  it('when a published guide is exported and the file imported, then exporting the import gives the same guide and content', async () => {
    const created = await author.post('/api/guides').send({ ...SAMPLE_GUIDE_META, content: sample() });
    expect(created.status).toBe(201);
    const id = created.body.guide.id;
    await author.post(`/api/guides/${id}/submit`).send({}).expect(200);
    await reviewer.post(`/api/guides/${id}/approve`).send({}).expect(200);

    const res = await author.get(`/api/guides/${id}/export?version=published`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(res.headers['content-disposition']).toBe('attachment; filename="drips-after-the-valve-closes-electric-valve.beadpath-guide.json"');
    const file = JSON.parse(res.text);
    expect(file).toMatchObject({ format: 'beadpath-guide', formatVersion: 1 });
    expect(file.guide.causes.map((c: Json) => c.code)).toContain('seat-worn');
    // html is rebuilt by whoever imports the file, so it is not carried.
    expect(file.content.steps[0].body).toEqual({ doc: SAMPLE_GUIDE.steps[0].body!.doc });

    const imported = await author.post('/api/guides/import').send(file);
    expect(imported.status, JSON.stringify(imported.body)).toBe(201);
    expect(imported.body).toMatchObject({ dropped: { articleIds: 0, photoIds: 0, tags: [] }, causesAdded: [] });
    const g = imported.body.guide;
    expect(g.id).not.toBe(id);
    expect(g).toMatchObject({ draftState: 'draft', published: null });
    expect(g.draft.validation.errors).toEqual([]);
    expect(g.events[0]).toMatchObject({ kind: 'imported', versionNumber: 1 });

    expect(g.draft.content.steps[0].body.html).toContain('Watch at least ten shots');

    const again = await exported(g.id);
    expect(again.content).toStrictEqual(file.content);
    expect(again.guide).toStrictEqual(file.guide);
  });

  it('when a valid file made elsewhere is imported and exported, then the content comes back exactly; html it carried is not kept', async () => {
    const file = sampleFile();
    const res = await author.post('/api/guides/import').send(file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const again = await exported(res.body.guide.id);
    expect(again.content).toStrictEqual(file.content);
    expect(again.guide).toStrictEqual(file.guide);

    const withHtml = sample();
    withHtml.steps[0].body = { ...withHtml.steps[0].body!, html: '<p>Their own rendering</p>' };
    const other = await author.post('/api/guides/import').send(sampleFile(withHtml));
    expect(other.status).toBe(201);
    expect(other.body.guide.draft.content.steps[0].body.html).not.toContain('Their own rendering');
    expect((await exported(other.body.guide.id)).content).toStrictEqual(file.content);
  });

  it('when a guide without a published version is exported, then its draft is; an unknown version is 404', async () => {
    const created = (await author.post('/api/guides').send({ ...SAMPLE_GUIDE_META, title: 'Draft only', content: sample() })).body.guide;
    const file = await exported(created.id, 'draft');
    expect(file.guide.title).toBe('Draft only');
    const plain = await author.get(`/api/guides/${created.id}/export`);
    expect(JSON.parse(plain.text).guide.title).toBe('Draft only');
    expect((await author.get(`/api/guides/${created.id}/export?version=published`)).status).toBe(404);
    expect((await author.get(`/api/guides/${created.id}/export?version=5`)).status).toBe(404);
  });

  it('when a file carries article links, photos, body html and tags of the other site, then they are left behind and counted', async () => {
    const content = sample();
    content.steps[0].articleIds = [41, 42];
    content.steps[indexOf(content, 'finding-seat-worn')].articleIds = [43];
    content.steps[1].photoIds = ['3f0c2a8e-5d7b-4c1e-9a62-1b8f4d7e9c01'];
    content.steps[0].body = {
      doc: {
        type: 'doc',
        content: [
          { type: 'paragraph', content: [{ type: 'text', text: 'See the photo.' }] },
          { type: 'image', attrs: { src: '/api/files/3f0c2a8e-5d7b-4c1e-9a62-1b8f4d7e9c02/display', alt: 'Seat' } },
        ],
      },
      html: '<p onclick="steal()">Trust me</p>',
    };
    const file = sampleFile(content);
    file.guide.tags = ['seat', 'their-own-tag'];

    const res = await author.post('/api/guides/import').send(file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.dropped).toEqual({ articleIds: 3, photoIds: 2, tags: ['their-own-tag'] });
    const draft = res.body.guide.draft;
    expect(draft.meta.tags).toEqual(['seat']);
    expect(draft.content.steps.flatMap((s: Json) => [...s.articleIds, ...s.photoIds])).toEqual([]);
    expect(draft.content.steps[0].body.html).toBe('<p>See the photo.</p>');
    expect(JSON.stringify(draft.content.steps[0].body.doc)).not.toContain('image');
  });

  it("when a file uses a cause the organisation does not have, then the cause is added to its list with the file's label", async () => {
    const content = sample();
    const finding = content.steps[indexOf(content, 'finding-seat-worn')] as Json;
    finding.causeCode = 'seat-cracked';
    const file = sampleFile(content);
    expect(file.guide.causes.map((c: Json) => c.code)).not.toContain('seat-cracked');
    file.guide.causes.push({ code: 'seat-cracked', label: 'Seat cracked by over-torque' });

    const before = (await author.get('/api/causes')).body.causes.map((c: Json) => c.code);
    expect(before).not.toContain('seat-cracked');
    const res = await author.post('/api/guides/import').send(file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.causesAdded).toEqual(['seat-cracked']);
    expect(res.body.guide.draft.validation.errors).toEqual([]);
    const after = (await author.get('/api/causes')).body.causes;
    expect(after.find((c: Json) => c.code === 'seat-cracked')).toMatchObject({ label: 'Seat cracked by over-torque', active: true });
    expect(after).toHaveLength(before.length + 1);
  });
});

describe('refusing a bad file', () => {
  it('when a file has several problems, then each is reported with its path and nothing is stored', async () => {
    const file = sampleFile();
    file.exportedAt = 'yesterday';
    file.guide.colour = 'blue';
    const pressure = indexOf(file.content, 'fluid-pressure');
    file.content.steps[pressure].bands[1].min = 5; // overlaps the band up to 5.5 bar
    const ask = indexOf(file.content, 'drip-when');
    file.content.steps[ask].choices[2].next = 'hot-nozzle'; // no such step
    const finding = indexOf(file.content, 'finding-air');
    file.content.steps[finding].causeCode = 'gremlins';
    const before = await guideCount();
    const causesBefore = Number((await t.db('causes').count('* as c').first())!.c);

    const res = await author.post('/api/guides/import').send(file);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    const problems = res.body.error.details.problems as { path: string; message: string }[];
    const paths = problems.map((p) => p.path);
    expect(paths).toEqual(
      expect.arrayContaining(['exportedAt', 'guide.colour', `content.steps[${pressure}].bands[1].min`, `content.steps[${ask}].choices[2].next`, `content.steps[${finding}].causeCode`]),
    );
    expect(res.body.error.message).toMatch(new RegExp(`${problems.length} problems`));
    expect(res.body.error.fields[`content.steps[${ask}].choices[2].next`]).toMatch(/'hot-nozzle', which does not exist/);
    expect(res.body.error.fields[`content.steps[${pressure}].bands[1].min`]).toMatch(/Overlap/);
    expect(res.body.error.fields[`content.steps[${finding}].causeCode`]).toMatch(/gremlins/);
    expect(await guideCount()).toBe(before);
    expect(Number((await t.db('causes').count('* as c').first())!.c)).toBe(causesBefore);
  });

  it('when the body is not a guide file at all, then one clear problem is reported', async () => {
    const list = await author.post('/api/guides/import').send([1, 2, 3]);
    expect(list.status).toBe(400);
    expect(list.body.error.details.problems).toEqual([{ path: '', message: 'A guide file must be a JSON object' }]);
    const other = await author.post('/api/guides/import').send({ format: 'spreadsheet' });
    expect(other.status).toBe(400);
    expect(other.body.error.fields.format).toMatch(/not a Beadpath guide file/);
  });

  it('when a file is larger than the request limit, then 413 and nothing is stored', async () => {
    const file = sampleFile();
    file.content.steps[0].body.doc.content.push({ type: 'paragraph', content: [{ type: 'text', text: 'x'.repeat(1_100_000) }] });
    const before = await guideCount();
    const res = await author.post('/api/guides/import').send(file);
    expect(res.status).toBe(413);
    expect(await guideCount()).toBe(before);
  });
});
