// User administration: invitations, roles, deactivation that ends sessions at once.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_PASSWORD, startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t?.close());

describe('admin users', () => {
  it('when an admin invites someone, then they appear pending, the link lets them set a password once and sign in', async () => {
    const { agent } = await t.signIn(['admin']);
    const res = await agent.post('/api/admin/users').send({ name: 'Ada Fenwick', email: 'Ada.Fenwick@example.com', roles: ['technician', 'author'] });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'ada.fenwick@example.com', roles: ['technician', 'author'], invitePending: true, active: true });
    const token = res.body.inviteToken as string;
    const list = await agent.get('/api/admin/users');
    expect(list.body.users.map((u: { email: string }) => u.email)).toContain('ada.fenwick@example.com');

    const invitee = t.agent();
    const info = await invitee.get(`/api/auth/invite/${token}`);
    expect(info.body).toMatchObject({ name: 'Ada Fenwick', email: 'ada.fenwick@example.com' });
    const weak = await invitee.post('/api/auth/invite/accept').send({ token, password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields.password).toBeTruthy();
    const accepted = await invitee.post('/api/auth/invite/accept').send({ token, password: 'a long enough passphrase' });
    expect(accepted.status).toBe(200);
    expect((await invitee.get('/api/auth/me')).body.user.email).toBe('ada.fenwick@example.com');
    const again = await t.agent().post('/api/auth/invite/accept').send({ token, password: 'another long passphrase' });
    expect(again.status).toBe(404);
  });

  it('when the e-mail is already used or the roles are unknown, then 409 / 400 name the field and nothing is added', async () => {
    const { agent } = await t.signIn(['admin']);
    const existing = await t.createUser(['technician']);
    const before = await t.db('users').count('* as n').first();
    const dup = await agent.post('/api/admin/users').send({ name: 'Dup', email: existing.email, roles: ['technician'] });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.email).toBeTruthy();
    const bad = await agent.post('/api/admin/users').send({ name: '', email: 'x@example.com', roles: ['wizard'] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['name']));
    expect(Object.keys(bad.body.error.fields).some((k) => k.startsWith('roles'))).toBe(true);
    const none = await agent.post('/api/admin/users').send({ name: 'No roles', email: 'y@example.com', roles: [] });
    expect(none.body.error.fields.roles).toMatch(/at least one role/);
    expect(await t.db('users').count('* as n').first()).toEqual(before);
  });

  it('when an admin deactivates a user, then that user\u2019s open session stops working at once', async () => {
    const { agent: admin } = await t.signIn(['admin']);
    const { agent: tech, user } = await t.signIn(['technician']);
    expect((await tech.get('/api/auth/me')).status).toBe(200);
    const res = await admin.patch(`/api/admin/users/${user.id}`).send({ active: false });
    expect(res.status).toBe(200);
    expect(res.body.user.active).toBe(false);
    expect((await tech.get('/api/calculators')).status).toBe(401);
    expect((await t.agent().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD })).status).toBe(401);
  });

  it('when an admin changes roles, then the user\u2019s next request has the new permissions', async () => {
    const { agent: admin } = await t.signIn(['admin']);
    const { agent: tech, user } = await t.signIn(['technician']);
    expect((await tech.get('/api/admin/users')).status).toBe(403);
    await admin
      .patch(`/api/admin/users/${user.id}`)
      .send({ roles: ['technician', 'admin'] })
      .expect(200);
    expect((await tech.get('/api/admin/users')).status).toBe(200);
  });

  it('when the last admin would lose the role or deactivate, then 409 and nothing changes', async () => {
    const solo = await startTestApp();
    try {
      const { agent, user } = await solo.signIn(['admin']);
      const res = await agent.patch(`/api/admin/users/${user.id}`).send({ roles: ['technician'] });
      expect(res.status).toBe(409);
      expect(res.body.error.fields.roles).toBeTruthy();
      expect((await solo.db('users').where({ id: user.id }).first()).roles).toEqual(['admin']);
    } finally {
      await solo.close();
    }
  });

  it('when an admin of one organisation names a user of another, then 404', async () => {
    const { agent } = await t.signIn(['admin']);
    const [org] = await t.db('organisations').insert({ name: 'Elsewhere Ltd' }).returning('id');
    const [other] = await t
      .db('users')
      .insert({ organisation_id: org.id, email: 'else@example.com', name: 'Else', roles: ['technician'] })
      .returning('id');
    const res = await agent.patch(`/api/admin/users/${other.id}`).send({ active: false });
    expect(res.status).toBe(404);
    expect((await t.db('users').where({ id: other.id }).first()).active).toBe(true);
  });
});
