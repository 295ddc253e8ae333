// Headers every response carries, and fields a client must not be able to set (mass assignment).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t?.close());

describe('security headers', () => {
  it('when any page or API answer is sent, then the policy forbids inline script and framing, and types are not sniffed', async () => {
    const res = await t.agent().get('/api/health');
    const csp = String(res.headers['content-security-policy']);
    const script = /script-src ([^;]*)/.exec(csp)?.[1] ?? '';
    expect(script).toContain("'self'");
    expect(script).not.toContain('unsafe-inline');
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBeTruthy();
  });
});

describe('mass assignment', () => {
  it('when a technician sends roles and an organisation with a profile change, then only the profile changes', async () => {
    const { agent, user } = await t.signIn(['technician']);
    const res = await agent.patch('/api/auth/me').send({ unitSystem: 'imperial', roles: ['admin'], organisationId: 999, active: false });
    expect(res.status).toBe(200);
    const row = await t.db('users').where({ id: user.id }).first();
    expect(row.roles).toEqual(['technician']);
    expect(row.organisation_id).toBe(t.organisationId);
    expect(row.active).toBe(true);
    expect(row.unit_system).toBe('imperial');
    expect((await agent.get('/api/admin/users')).status).toBe(403);
  });

  it('when an author creates an article claiming it is published and belongs elsewhere, then it is a draft of their own organisation', async () => {
    const { agent } = await t.signIn(['author']);
    const res = await agent.post('/api/articles').send({
      title: 'Seal kit storage',
      body: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Keep seal kits cool and dark.' }] }] },
      workflow: 'published',
      organisationId: 999,
      publishedRevisionId: 1,
    });
    expect(res.status).toBe(201);
    const row = await t.db('articles').where({ id: res.body.article.id }).first();
    expect(row.workflow).toBe('draft');
    expect(row.organisation_id).toBe(t.organisationId);
    expect(row.published_revision_id).toBeNull();
  });
});
