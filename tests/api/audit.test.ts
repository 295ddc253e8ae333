// The audit log: the changes that matter leave an event with who, what and a before/after summary,
// admins read it filtered and paged within their own organisation, and no row can be changed or removed.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SAMPLE_GUIDE, SAMPLE_GUIDE_META } from '../../src/shared/guides/sample';
import type { AuditEventView } from '../../src/shared/schemas/audit';
import { startTestApp, type TestApp } from '../helpers/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>['agent'];
let t: TestApp;
let admin: Agent;
let adminId: number;
let author: Agent;
let authorId: number;
let reviewer: Agent;

beforeAll(async () => {
  t = await startTestApp();
  ({
    agent: admin,
    user: { id: adminId },
  } = await t.signIn(['admin']));
  ({
    agent: author,
    user: { id: authorId },
  } = await t.signIn(['author']));
  reviewer = (await t.signIn(['author'])).agent;
});
afterAll(async () => t?.close());

async function events(query: Record<string, string | number> = {}): Promise<AuditEventView[]> {
  const res = await admin.get('/api/admin/audit').query(query);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.events;
}
const latest = async (action: string) => (await events({ action }))[0];

describe('audit log', () => {
  it('when a guide is approved, retired, restored, exported and imported, then each leaves an event naming the person and the guide', async () => {
    const g = (
      await author
        .post('/api/guides')
        .send({ ...SAMPLE_GUIDE_META, title: `Audited guide ${randomUUID().slice(0, 6)}`, content: SAMPLE_GUIDE })
        .expect(201)
    ).body.guide;
    await author.post(`/api/guides/${g.id}/submit`).send({}).expect(200);
    await reviewer.post(`/api/guides/${g.id}/approve`).send({}).expect(200);
    await author.post(`/api/guides/${g.id}/retire`).send({}).expect(200);
    await author.post(`/api/guides/${g.id}/restore`).send({}).expect(200);
    const file = (await author.get(`/api/guides/${g.id}/export?version=published`).expect(200)).body;
    const imported = (
      await author
        .post('/api/guides/import')
        .send({ ...file, guide: { ...file.guide, title: `${file.guide.title} copy` } })
        .expect(201)
    ).body.guide;

    const approve = await latest('guide.approve');
    expect(approve).toMatchObject({ entityKind: 'guide', entityId: String(g.id), after: { version: 1 } });
    expect(approve.userId).not.toBe(authorId);
    expect(await latest('guide.retire')).toMatchObject({ entityId: String(g.id), userId: authorId, before: { status: 'active' }, after: { status: 'retired' } });
    expect(await latest('guide.restore')).toMatchObject({ entityId: String(g.id), before: { status: 'retired' }, after: { status: 'active' } });
    expect(await latest('guide.export')).toMatchObject({ entityId: String(g.id), userId: authorId });
    expect(await latest('guide.import')).toMatchObject({ entityId: String(imported.id), userId: authorId });
  });

  it('when an article is approved and archived, then both are in the log with the workflow before and after', async () => {
    const body = { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Swab the seat.' }] }] };
    const a = (
      await author
        .post('/api/articles')
        .send({ title: `Audited article ${randomUUID().slice(0, 6)}`, body })
        .expect(201)
    ).body.article;
    await author.post(`/api/articles/${a.id}/submit`).send({}).expect(200);
    await reviewer.post(`/api/articles/${a.id}/approve`).send({}).expect(200);
    await author.post(`/api/articles/${a.id}/archive`).send({}).expect(200);
    expect(await latest('article.approve')).toMatchObject({ entityId: String(a.id), before: { workflow: 'in_review' }, after: { workflow: 'published' } });
    expect(await latest('article.archive')).toMatchObject({ entityId: String(a.id), userId: authorId, before: { workflow: 'published' }, after: { workflow: 'archived' } });
  });

  it('when an admin invites, changes roles and deactivates a user, then the log holds each step with roles and state before and after', async () => {
    const email = `audited-${randomUUID().slice(0, 6)}@example.com`;
    const u = (
      await admin
        .post('/api/admin/users')
        .send({ email, name: 'Audited person', roles: ['technician'] })
        .expect(201)
    ).body.user;
    await admin
      .patch(`/api/admin/users/${u.id}`)
      .send({ roles: ['technician', 'support'] })
      .expect(200);
    await admin.patch(`/api/admin/users/${u.id}`).send({ active: false }).expect(200);
    expect(await latest('user.invite')).toMatchObject({ entityId: String(u.id), userId: adminId, after: { email, roles: ['technician'] } });
    expect(await latest('user.roles')).toMatchObject({ before: { roles: ['technician'] }, after: { roles: ['technician', 'support'] } });
    expect(await latest('user.deactivate')).toMatchObject({ before: { active: true }, after: { active: false } });
  });

  it('when settings, tags and causes change and applicators are imported from CSV, then each change is logged', async () => {
    await admin.patch('/api/admin/settings').send({ allowSelfPublish: true }).expect(200);
    expect(await latest('settings.update')).toMatchObject({ userId: adminId, before: { allowSelfPublish: false }, after: { allowSelfPublish: true } });

    const tags = (await admin.get('/api/admin/tags').expect(200)).body.tags as { slug: string; active: boolean }[];
    const dropped = tags.find((x) => x.active)!;
    await admin
      .put('/api/admin/tags')
      .send({ tags: tags.filter((x) => x !== dropped) })
      .expect(200);
    const tagEvent = await latest('tags.replace');
    expect(JSON.stringify(tagEvent.before)).toContain(dropped.slug);
    expect((tagEvent.after as { active: string[] }).active.some((s) => s.endsWith(`:${dropped.slug}`))).toBe(false);

    const causes = (await admin.get('/api/causes').expect(200)).body.causes as { code: string; label: string }[];
    await admin
      .put('/api/causes')
      .send({ causes: causes.slice(1).map((c) => ({ code: c.code, label: c.label })) })
      .expect(200);
    expect(await latest('causes.replace')).toMatchObject({ userId: adminId, before: { active: expect.arrayContaining([causes[0].code]) }, after: { active: causes.slice(1).map((c) => c.code) } });

    await admin.post('/api/applicators/import/sites').set('Content-Type', 'text/csv').send('Site\nAudit Lane\nAudit Yard\n').expect(201);
    expect(await latest('assets.import')).toMatchObject({ entityKind: 'sites', userId: adminId, after: { imported: 2 } });
  });

  it('when the log is read with filters and pages, then it answers newest first and only what matches', async () => {
    const all = await events({ pageSize: 200 });
    expect(all.length).toBeGreaterThan(10);
    const times = all.map((e) => e.at);
    expect([...times].sort().reverse()).toEqual(times);
    const page1 = (await admin.get('/api/admin/audit').query({ pageSize: 3, page: 1 })).body;
    const page2 = (await admin.get('/api/admin/audit').query({ pageSize: 3, page: 2 })).body;
    expect(page1.total).toBe(all.length);
    expect(page1.events.map((e: AuditEventView) => e.id)).toEqual(all.slice(0, 3).map((e) => e.id));
    expect(page2.events.map((e: AuditEventView) => e.id)).toEqual(all.slice(3, 6).map((e) => e.id));
    const byAdmin = await events({ userId: adminId, pageSize: 200 });
    expect(byAdmin.length).toBeGreaterThan(0);
    expect(byAdmin.every((e) => e.userId === adminId && e.userName)).toBe(true);
    expect((await events({ entityKind: 'article' })).every((e) => e.entityKind === 'article')).toBe(true);
    const today = new Date().toISOString().slice(0, 10);
    expect((await events({ from: today, to: today, pageSize: 200 })).length).toBe(all.length);
    expect(await events({ from: '2000-01-01', to: '2000-01-02' })).toEqual([]);
    expect((await admin.get('/api/admin/audit').query({ from: 'yesterday' })).status).toBe(400);
  });

  it("when another organisation's admin reads the log, then none of these events is there", async () => {
    const [org] = await t.db('organisations').insert({ name: 'Audit elsewhere' }).returning('id');
    await t.db('audit_events').insert({ organisation_id: org.id, user_id: null, action: 'settings.update', entity_kind: 'organisation' });
    const [other] = await t
      .db('users')
      .insert({
        organisation_id: org.id,
        email: `aud-${randomUUID().slice(0, 6)}@example.com`,
        name: 'Other admin',
        roles: ['admin'],
        password_hash: (await t.db('users').where({ id: adminId }).first()).password_hash,
      })
      .returning('*');
    const agent = t.agent();
    await agent.post('/api/auth/login').send({ email: other.email, password: 'correct horse battery staple' }).expect(200);
    const res = await agent.get('/api/admin/audit').expect(200);
    expect(res.body.total).toBe(1);
    expect((await events({ pageSize: 200 })).some((e) => e.action === 'settings.update' && e.userId === null)).toBe(false);
  });

  it('when anything tries to change or remove an audit row, even straight in the database, then it is refused', async () => {
    const [row] = await t.db('audit_events').where({ organisation_id: t.organisationId }).limit(1);
    await expect(t.db('audit_events').where({ id: row.id }).update({ action: 'nothing.happened' })).rejects.toThrow(/append-only/);
    await expect(t.db('audit_events').where({ id: row.id }).del()).rejects.toThrow(/append-only/);
    await expect(t.db.raw('delete from audit_events')).rejects.toThrow(/append-only/);
    expect((await t.db('audit_events').where({ id: row.id }).first()).action).toBe(row.action);
  });

  it('when a technician asks for the log, then it is refused', async () => {
    const { agent } = await t.signIn(['technician']);
    expect((await agent.get('/api/admin/audit')).status).toBe(403);
  });
});
