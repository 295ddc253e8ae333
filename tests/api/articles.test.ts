// Articles over HTTP: the review workflow per role, optimistic locking, revisions, sanitising of
// everything saved, and what readers can and cannot see.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sanitizeHtml } from '../../server/lib/rich-text';
import { XSS_VECTORS } from '../fixtures/xss-vectors';
import { dangers } from '../helpers/html-safety';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let author: Agent;
let reviewer: Agent;
let tech: Agent;

beforeAll(async () => {
  t = await startTestApp();
  author = (await t.signIn(['author'])).agent;
  reviewer = (await t.signIn(['author'])).agent;
  tech = (await t.signIn(['technician'])).agent;
});
afterAll(async () => t?.close());

const para = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] });
const doc = (...content: unknown[]) => ({ type: 'doc', content });
let n = 0;
const uniqueTitle = (base: string) => `${base} ${++n}`;

async function createArticle(title = uniqueTitle('Reseating a needle'), body = doc(para('Clean the seat with a lint-free swab.'))) {
  const res = await author.post('/api/articles').send({ title, summary: 'How to', body, tags: ['seat', 'electric'] });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.article;
}

describe('article workflow', () => {
  it('when an author writes, submits and another author approves, then technicians see the published text', async () => {
    const a = await createArticle();
    expect(a).toMatchObject({ workflow: 'draft', published: false, headRevision: 1 });
    expect((await tech.get(`/api/articles/${a.id}`)).status).toBe(404);
    expect((await tech.get('/api/articles')).body.articles.map((x: { id: number }) => x.id)).not.toContain(a.id);

    const sub = await author.post(`/api/articles/${a.id}/submit`);
    expect(sub.body.article.workflow).toBe('in_review');
    const self = await author.post(`/api/articles/${a.id}/approve`).send({});
    expect(self.status).toBe(403);
    expect(self.body.error.message).toMatch(/different author/);

    const queue = await reviewer.get('/api/articles?status=review-queue');
    expect(queue.body.articles.map((x: { id: number }) => x.id)).toContain(a.id);
    const ok = await reviewer.post(`/api/articles/${a.id}/approve`).send({ comment: 'Clear and correct' });
    expect(ok.status).toBe(200);
    expect(ok.body.article).toMatchObject({ workflow: 'published', published: true });
    expect(ok.body.article.reviewedByName).toBeTruthy();

    const read = await tech.get(`/api/articles/${a.id}`);
    expect(read.status).toBe(200);
    expect(read.body.article.publishedRevision.html).toContain('lint-free swab');
    expect(read.body.article.head).toBeNull();
    expect(read.body.article.events).toEqual([]);
  });

  it('when a published article is edited, then readers keep the published text until the new revision is approved', async () => {
    const a = await createArticle();
    await author.post(`/api/articles/${a.id}/submit`).expect(200);
    const pub = (await reviewer.post(`/api/articles/${a.id}/approve`).send({})).body.article;
    const saved = await author
      .put(`/api/articles/${a.id}`)
      .send({ title: pub.title, summary: 'How to', body: doc(para('New method: use the seat tool BP-TOOL-7.')), tags: ['seat'], baseVersion: pub.version });
    expect(saved.status).toBe(200);
    expect(saved.body.article).toMatchObject({ workflow: 'draft', published: true, hasUnpublishedChanges: true, headRevision: 2 });
    const read = (await tech.get(`/api/articles/${a.id}`)).body.article;
    expect(read.publishedRevision.html).toContain('lint-free swab');
    expect(read.publishedRevision.html).not.toContain('BP-TOOL-7');
    await author.post(`/api/articles/${a.id}/submit`).expect(200);
    await reviewer.post(`/api/articles/${a.id}/approve`).send({}).expect(200);
    expect((await tech.get(`/api/articles/${a.id}`)).body.article.publishedRevision.html).toContain('BP-TOOL-7');
  });

  it('when a reviewer sends an article back, then it is a draft again with the comment in its history', async () => {
    const a = await createArticle();
    await author.post(`/api/articles/${a.id}/submit`).expect(200);
    const empty = await reviewer.post(`/api/articles/${a.id}/request-changes`).send({ comment: '' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.comment).toBeTruthy();
    const back = await reviewer.post(`/api/articles/${a.id}/request-changes`).send({ comment: 'Add the torque for the nozzle nut' });
    expect(back.body.article.workflow).toBe('draft');
    expect(back.body.article.events[0]).toMatchObject({ kind: 'changes_requested', comment: 'Add the torque for the nozzle nut' });
  });

  it('when an article is archived, then readers no longer find it; restoring brings it back', async () => {
    const a = await createArticle();
    await author.post(`/api/articles/${a.id}/submit`).expect(200);
    await reviewer.post(`/api/articles/${a.id}/approve`).send({}).expect(200);
    await author.post(`/api/articles/${a.id}/archive`).expect(200);
    expect((await tech.get(`/api/articles/${a.id}`)).status).toBe(404);
    const back = await author.post(`/api/articles/${a.id}/unarchive`);
    expect(back.body.article.workflow).toBe('published');
    expect((await tech.get(`/api/articles/${a.id}`)).status).toBe(200);
  });

  it('when the organisation allows self-publishing, then the submitting author may approve', async () => {
    const other = await startTestApp();
    try {
      const { agent: admin } = await other.signIn(['admin']);
      const { agent: solo } = await other.signIn(['author']);
      const created = (await solo.post('/api/articles').send({ title: 'Alone', body: doc(para('x')) })).body.article;
      await solo.post(`/api/articles/${created.id}/submit`).expect(200);
      expect((await solo.post(`/api/articles/${created.id}/approve`).send({})).status).toBe(403);
      await admin.patch('/api/admin/settings').send({ allowSelfPublish: true }).expect(200);
      expect((await solo.post(`/api/articles/${created.id}/approve`).send({})).status).toBe(200);
    } finally {
      await other.close();
    }
  });

  it('when a technician tries to write or review, then 403', async () => {
    const a = await createArticle();
    expect((await tech.post('/api/articles').send({ title: 'Mine', body: doc(para('x')) })).status).toBe(403);
    expect((await tech.put(`/api/articles/${a.id}`).send({})).status).toBe(403);
    expect((await tech.post(`/api/articles/${a.id}/approve`).send({})).status).toBe(403);
  });
});

describe('no lost work', () => {
  it('when two authors save from the same version, then the second gets 409 with the current text and nothing is overwritten', async () => {
    const a = await createArticle();
    const first = await author.put(`/api/articles/${a.id}`).send({ title: a.title, body: doc(para('Author one text')), baseVersion: a.version });
    expect(first.status).toBe(200);
    const second = await reviewer.put(`/api/articles/${a.id}`).send({ title: a.title, body: doc(para('Author two text')), baseVersion: a.version });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('conflict');
    expect(second.body.error.message).toMatch(/Someone else changed this article/);
    expect(second.body.error.details.current.revision.html).toContain('Author one text');
    const now = (await author.get(`/api/articles/${a.id}`)).body.article;
    expect(now.head.html).toContain('Author one text');
    expect(now.headRevision).toBe(2);
  });

  it('when autosaves come in quick succession, then they fold into one revision; a manual save starts a new one', async () => {
    const a = await createArticle();
    let v = a.version;
    for (const text of ['Draft one', 'Draft one two', 'Draft one two three']) {
      const r = await author.put(`/api/articles/${a.id}`).send({ title: a.title, body: doc(para(text)), baseVersion: v, autosave: true });
      expect(r.status).toBe(200);
      v = r.body.article.version;
    }
    const after = (await author.get(`/api/articles/${a.id}`)).body.article;
    expect(after.headRevision).toBe(1);
    expect(after.head.html).toContain('Draft one two three');
    const manual = await author.put(`/api/articles/${a.id}`).send({ title: a.title, body: doc(para('Checked')), baseVersion: v });
    expect(manual.body.article.headRevision).toBe(2);
    // Another author's autosave never folds into someone else's revision.
    const other = await reviewer.put(`/api/articles/${a.id}`).send({ title: a.title, body: doc(para('Checked again')), baseVersion: manual.body.article.version, autosave: true });
    expect(other.body.article.headRevision).toBe(3);
  });

  it('when an old revision is compared and restored, then the diff is readable and the restored text becomes a new revision', async () => {
    const a = await createArticle(uniqueTitle('Seal kit'), doc(para('Use the green O-ring.'), para('Torque the cap by hand.')));
    const s = await author.put(`/api/articles/${a.id}`).send({ title: a.title, body: doc(para('Use the blue O-ring.'), para('Torque the cap by hand.')), baseVersion: a.version });
    const cmp = await author.get(`/api/articles/${a.id}/compare?from=1&to=2`);
    expect(cmp.status).toBe(200);
    const removed = cmp.body.comparison.body
      .filter((c: { change: string }) => c.change === 'removed')
      .map((c: { value: string }) => c.value)
      .join('');
    const added = cmp.body.comparison.body
      .filter((c: { change: string }) => c.change === 'added')
      .map((c: { value: string }) => c.value)
      .join('');
    expect(removed).toContain('green');
    expect(added).toContain('blue');
    const restored = await author.post(`/api/articles/${a.id}/revisions/1/restore`).send({ baseVersion: s.body.article.version });
    expect(restored.status).toBe(200);
    expect(restored.body.article.headRevision).toBe(3);
    expect(restored.body.article.head.html).toContain('green');
    const revs = (await author.get(`/api/articles/${a.id}/revisions`)).body.revisions;
    expect(revs.map((r: { number: number }) => r.number)).toEqual([3, 2, 1]);
    expect(revs[0].note).toBe('Restored from revision 1');
  });
});

describe('bad article input', () => {
  it('when the title is empty, duplicates another, the body is too long or a tag is unknown, then a clear 4xx and nothing is stored', async () => {
    const before = Number((await t.db('articles').count('* as c').first())!.c);
    const empty = await author.post('/api/articles').send({ title: '  ', body: doc(para('x')) });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.title).toMatch(/required/);
    const a = await createArticle(uniqueTitle('Unique title'));
    const dup = await author.post('/api/articles').send({ title: a.title.toUpperCase(), body: doc(para('x')) });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.title).toMatch(/already exists/);
    const long = await author.post('/api/articles').send({ title: uniqueTitle('Long'), body: doc(...Array.from({ length: 40 }, () => para('x'.repeat(15000)))) });
    expect([400, 413]).toContain(long.status);
    const tag = await author.post('/api/articles').send({ title: uniqueTitle('Tagged'), body: doc(para('x')), tags: ['flux-capacitor'] });
    expect(tag.status).toBe(400);
    expect(tag.body.error.fields.tags).toMatch(/flux-capacitor/);
    expect(Number((await t.db('articles').count('* as c').first())!.c)).toBe(before + 1);
  });
});

describe('sanitising (vectors after the OWASP XSS Filter Evasion Cheat Sheet)', () => {
  it('when each vector goes through the HTML sanitiser, then nothing that can run script is left', () => {
    for (const v of XSS_VECTORS) expect(dangers(sanitizeHtml(v)), v).toEqual([]);
  });

  it('when vectors are saved as text, link targets, image sources, hazards and node types, then the stored HTML is inert', async () => {
    const nodes = XSS_VECTORS.flatMap((v) => [
      para(v),
      { type: 'paragraph', content: [{ type: 'text', text: 'link', marks: [{ type: 'link', attrs: { href: v.replace(/^.*?(javascript|data|vbscript)/i, '$1') } }] }] },
      { type: 'image', attrs: { src: v, alt: v, onerror: 'window.__xss=1' } },
      { type: 'caution', attrs: { hazard: v }, content: [para('cool down')] },
      { type: 'script', content: [{ type: 'text', text: v }] },
      { type: 'heading', attrs: { level: '2 onclick=x' }, content: [{ type: 'text', text: v }] },
    ]);
    const res = await author.post('/api/articles').send({ title: uniqueTitle('Vectors'), body: doc(...nodes) });
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(201);
    const html: string = res.body.article.head.html;
    expect(dangers(html)).toEqual([]);
    const row = await t.db('article_revisions').where({ article_id: res.body.article.id }).first();
    expect(dangers(row.body_html)).toEqual([]);
    const walk = (node: { type: string; attrs?: Record<string, unknown>; content?: unknown[] }): void => {
      expect(['script']).not.toContain(node.type);
      expect(Object.keys(node.attrs ?? {}).filter((k) => k.startsWith('on'))).toEqual([]);
      if (node.type === 'heading') expect([2, 3]).toContain(node.attrs?.level);
      for (const c of (node.content ?? []) as (typeof node)[]) walk(c);
    };
    walk(row.body_json);
  });
});
