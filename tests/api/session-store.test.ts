// Sessions are read with their user in one statement: no second read of the user per request,
// and still fresh on every request (roles, deactivation, sign-out elsewhere take effect at once).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t?.close());

describe('session store', () => {
  it('when a signed-in request arrives, then the user comes with the session and the app does not read users again', async () => {
    const { agent, user } = await t.signIn(['technician']);
    const statements: string[] = [];
    const listen = (q: { sql: string }) => statements.push(q.sql);
    t.db.on('query', listen);
    try {
      const me = (await agent.get('/api/auth/me').expect(200)).body;
      expect(me.user).toMatchObject({ id: user.id, roles: ['technician'], organisationId: t.organisationId });
    } finally {
      t.db.off('query', listen);
    }
    expect(statements.filter((s) => /from "users"/i.test(s))).toEqual([]);
  });

  it('when roles change or the user is deactivated straight in the database, then the very next request sees it', async () => {
    const { agent, user } = await t.signIn(['technician']);
    await agent.get('/api/admin/users').expect(403);
    await t
      .db('users')
      .where({ id: user.id })
      .update({ roles: ['technician', 'admin'] });
    await agent.get('/api/admin/users').expect(200);
    await t.db('users').where({ id: user.id }).update({ active: false });
    expect((await agent.get('/api/auth/me').expect(200)).body.user).toBeNull();
    await agent.get('/api/guides').expect(401);
  });

  it('when the session row is removed (sign-out on another server), then the next request is signed out', async () => {
    const { agent, user } = await t.signIn(['support']);
    await agent.get('/api/auth/me').expect(200);
    await t.db('user_sessions').whereRaw(`(sess #>> '{passport,user}')::int = ?`, [user.id]).delete();
    expect((await agent.get('/api/auth/me').expect(200)).body.user).toBeNull();
  });

  it('when a stored session names no user or a non-numeric one, then it is treated as signed out, not an error', async () => {
    const { agent } = await t.signIn(['technician']);
    await t.db('user_sessions').update({ sess: t.db.raw(`json_build_object('cookie', sess -> 'cookie', 'passport', json_build_object('user', 'abc'))`) });
    expect((await agent.get('/api/auth/me').expect(200)).body.user).toBeNull();
    await t.db('user_sessions').update({ sess: t.db.raw(`json_build_object('cookie', sess -> 'cookie', 'passport', json_build_object('user', 999999))`) });
    expect((await agent.get('/api/auth/me').expect(200)).body.user).toBeNull();
  });
});
