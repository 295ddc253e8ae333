// Sign-in, sessions, sign-out, passwords, rate limits and the cross-site request guard.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_PASSWORD, startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ LOGIN_RATE_LIMIT: '5' });
});
afterAll(async () => t?.close());

describe('sign-in', () => {
  it('when the password is right, then the session works, the id changes and the cookie is httpOnly and SameSite=Lax', async () => {
    const user = await t.createUser(['technician', 'author']);
    const agent = t.agent();
    // A session started before sign-in (fixation attempt) must not survive it.
    const pre = await agent.post('/api/auth/login').send({ email: user.email, password: 'wrong password here' });
    expect(pre.status).toBe(401);
    const res = await agent.post('/api/auth/login').send({ email: user.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(user.email);
    expect(res.body.user.roles).toEqual(['technician', 'author']);
    expect(res.body.permissions).toContain('calculators:use');
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/beadpath\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.id).toBe(user.id);
    const rows = await t.db('users').where({ id: user.id }).first();
    expect(rows.last_sign_in_at).not.toBeNull();
  });

  it('when the password is wrong, then 401 with a message that does not say which part was wrong', async () => {
    const user = await t.createUser(['technician']);
    const res = await t.agent().post('/api/auth/login').send({ email: user.email, password: 'not the password' });
    expect(res.status).toBe(401);
    expect(res.body.error).toMatchObject({ code: 'unauthenticated', message: 'E-mail or password is not correct' });
    const unknown = await t.agent().post('/api/auth/login').send({ email: 'nobody@example.com', password: 'whatever it is' });
    expect(unknown.body.error.message).toBe(res.body.error.message);
  });

  it('when fields are missing or malformed, then 400 names the fields', async () => {
    const res = await t.agent().post('/api/auth/login').send({ email: 'not-an-email' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'password']);
  });

  it('when a deactivated user signs in, then it is refused like a wrong password', async () => {
    const user = await t.createUser(['technician'], { active: false });
    const res = await t.agent().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(401);
  });

  it('when someone keeps guessing one e-mail, then after the limit they get 429 and even the right password waits', async () => {
    const user = await t.createUser(['support']);
    for (let i = 0; i < 5; i++) {
      const r = await t
        .agent()
        .post('/api/auth/login')
        .send({ email: user.email, password: `guess number ${i}` });
      expect(r.status).toBe(401);
    }
    const limited = await t.agent().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    // Another e-mail from the same address is not locked out by it.
    const other = await t.createUser(['support']);
    expect((await t.agent().post('/api/auth/login').send({ email: other.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('when signing out, then the session no longer works', async () => {
    const { agent } = await t.signIn(['manager']);
    expect((await agent.post('/api/auth/logout')).status).toBe(204);
    expect((await agent.get('/api/calculators')).status).toBe(401);
  });
});

describe('cross-site request guard', () => {
  it('when a state-changing request comes from another origin or none, then 403; from our origin it passes', async () => {
    const user = await t.createUser(['technician']);
    const body = { email: user.email, password: TEST_PASSWORD };
    const foreign = await t.agent().post('/api/auth/login').set('Origin', 'https://evil.example.net').send(body);
    expect(foreign.status).toBe(403);
    expect(foreign.body.error.code).toBe('forbidden');
    const { default: request } = await import('supertest');
    const none = await request(t.url).post('/api/auth/login').send(body);
    expect(none.status).toBe(403);
    const viaReferer = await request(t.url).post('/api/auth/login').set('Referer', `${t.url}/sign-in`).send(body);
    expect(viaReferer.status).toBe(200);
  });
});

describe('passwords', () => {
  it('when changing the password, then the old one stops working, the new one works and other sessions end', async () => {
    const user = await t.createUser(['author']);
    const a = t.agent();
    const b = t.agent();
    await a.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(200);
    await b.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(200);
    const res = await a.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'a much longer new secret' });
    expect(res.status).toBe(204);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    expect((await b.get('/api/calculators')).status).toBe(401);
    expect((await t.agent().post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await t.agent().post('/api/auth/login').send({ email: user.email, password: 'a much longer new secret' })).status).toBe(200);
  });

  it('when the new password is short, common or the current one is wrong, then 400 names the field and nothing changes', async () => {
    const { agent, user } = await t.signIn(['technician']);
    const before = (await t.db('users').where({ id: user.id }).first()).password_hash;
    const short = await agent.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields.newPassword).toMatch(/at least 12/);
    const common = await agent.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'passwordpassword' });
    expect(common.body.error.fields.newPassword).toMatch(/too common/);
    const wrong = await agent.post('/api/auth/password').send({ currentPassword: 'not my password', newPassword: 'a fine long passphrase' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.currentPassword).toBeTruthy();
    expect((await t.db('users').where({ id: user.id }).first()).password_hash).toBe(before);
  });

  it('when the stored hash is read, then it is scrypt with a salt, never the password', async () => {
    const user = await t.createUser(['technician']);
    const row = await t.db('users').where({ id: user.id }).first();
    expect(row.password_hash).toMatch(/^scrypt\$16384\$8\$1\$/);
    expect(row.password_hash).not.toContain(TEST_PASSWORD);
  });
});

describe('profile', () => {
  it('when a user picks imperial units, then /me says so; a bad value is refused by name', async () => {
    const { agent } = await t.signIn(['technician']);
    const ok = await agent.patch('/api/auth/me').send({ unitSystem: 'imperial' });
    expect(ok.status).toBe(200);
    expect((await agent.get('/api/auth/me')).body.user.unitSystem).toBe('imperial');
    const bad = await agent.patch('/api/auth/me').send({ unitSystem: 'cubits' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.unitSystem).toBeTruthy();
  });
});
