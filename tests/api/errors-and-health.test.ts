// The one error shape for every failure, the health route, and behaviour when PostgreSQL goes away.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ JSON_BODY_LIMIT: '10kb' });
});
afterAll(async () => t?.close());

describe('error shape', () => {
  it('when an API route does not exist, then 404 JSON, not the page', async () => {
    const res = await t.agent().get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/json/);
    expect(res.body.error).toMatchObject({ code: 'not_found' });
    expect(res.body.error.requestId).toBe(res.headers['x-request-id']);
  });

  it('when the body is malformed JSON, then 400 says so', async () => {
    const res = await t.agent().post('/api/auth/login').set('Content-Type', 'application/json').send('{"email": ');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/not valid JSON/);
  });

  it('when the body is over the limit, then 413', async () => {
    const res = await t
      .agent()
      .post('/api/auth/login')
      .send({ email: 'a@example.com', password: 'x'.repeat(20_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
  });

  it('when a response is sent, then security headers and a content security policy come with it', async () => {
    const res = await t.agent().get('/api/health');
    expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/);
    expect(res.headers['content-security-policy']).toMatch(/script-src 'self'/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});

describe('health', () => {
  it('when the database is up, then ok', async () => {
    const res = await t.agent().get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'ok', database: 'ok' });
  });

  it('when PostgreSQL goes away, then health and other routes answer 503 in the error shape, and all recovers when it is back', async () => {
    const broken = await startTestApp({}, { viaProxy: true });
    try {
      const { agent } = await broken.signIn(['admin']);
      await broken.proxy!.cut();
      const health = await agent.get('/api/health');
      expect(health.status).toBe(503);
      expect(health.body.database).toBe('down');
      const users = await agent.get('/api/admin/users');
      expect(users.status).toBe(503);
      expect(users.body.error.code).toBe('unavailable');
      expect(users.body.error.message).toMatch(/database is not reachable/);
      await broken.proxy!.restore();
      // The server kept running and makes new connections by itself.
      const again = await agent.get('/api/health');
      expect(again.status).toBe(200);
      expect((await agent.get('/api/admin/users')).status).toBe(200);
    } finally {
      await broken.close();
    }
  });
});
