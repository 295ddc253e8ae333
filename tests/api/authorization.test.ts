// Walks every registered API route as each role and as nobody: the access rule of each route in
// the route table must match the permission table, and no route may exist outside the table.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Router } from 'express';
import { ROLES, can, type Role } from '../../src/shared/permissions';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
const agents = new Map<Role, Awaited<ReturnType<TestApp['signIn']>>['agent']>();

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ROLES) agents.set(role, (await t.signIn([role])).agent);
});
afterAll(async () => t?.close());

function samplePath(path: string) {
  return path
    .replace(/:token/g, 'x'.repeat(32))
    .replace(/:id/g, '999999')
    .replace(/:[a-zA-Z]+/g, 'sample');
}

function countRoutes(stack: Router['stack']): number {
  let n = 0;
  for (const layer of stack) {
    if (layer.route) n++;
    const inner = (layer.handle as unknown as { stack?: Router['stack'] }).stack;
    if (inner) n += countRoutes(inner);
  }
  return n;
}

describe('authorisation of every API route', () => {
  it('when the app is built, then every Express route is in the route table with an access rule', () => {
    const table = t.app.locals.routeTable;
    expect(table.length).toBeGreaterThan(5);
    const router = (t.app as unknown as { router: Router }).router;
    // Tests run without the built client, so there is no single-page fallback route to count.
    expect(countRoutes(router.stack)).toBe(table.length);
    for (const r of table) expect(r.access, `${r.method} ${r.path}`).toBeTruthy();
  });

  it('when nobody is signed in, then every non-public route answers 401 in the error shape', async () => {
    for (const r of t.app.locals.routeTable) {
      if (r.access === 'public') continue;
      const res = await t.agent()[r.method](samplePath(r.path)).send({});
      expect(res.status, `${r.method.toUpperCase()} ${r.path}`).toBe(401);
      expect(res.body.error.code).toBe('unauthenticated');
      expect(res.body.error.requestId).toBeTruthy();
    }
  });

  for (const role of ROLES) {
    it(`when signed in as ${role}, then each route is allowed or refused exactly as the permission table says`, async () => {
      const agent = agents.get(role)!;
      for (const r of t.app.locals.routeTable) {
        if (r.path === '/api/auth/logout') continue; // would end this agent's session
        const res = await agent[r.method](samplePath(r.path)).send({});
        const label = `${role}: ${r.method.toUpperCase()} ${r.path} -> ${res.status}`;
        if (r.access === 'public' || r.access === 'signedIn' || can([role], r.access)) {
          expect([401, 403], label).not.toContain(res.status);
        } else {
          expect(res.status, label).toBe(403);
          expect(res.body.error.code).toBe('forbidden');
        }
        expect(res.status, label).toBeLessThan(500);
      }
    });
  }
});
