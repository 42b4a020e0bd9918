import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { concretePath, createTestContext, listApiRoutes, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

const MUTATING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
/**
 * Web Push: every user registers and removes their OWN browsers; the notification's Acknowledge
 * is authorised by its signed token, not the session (tests/integration/push-alarms.test.ts).
 */
function PUSH_SELF_SERVICE(): string[] {
  return ['POST /api/push/subscriptions', 'DELETE /api/push/subscriptions', 'POST /api/push/acknowledge'];
}
// Routes every signed-in user may call on their own account (alarm subscriptions: the session's user only, tests/integration/alarms.test.ts).
const SELF_SERVICE = new Set(['POST /api/auth/login', 'POST /api/auth/logout', 'POST /api/auth/password', 'PUT /api/alarms/subscriptions', ...PUSH_SELF_SERVICE()]);

let t: TestContext;
let viewer: SignedInAgent;
let technician: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  viewer = await signInAs(t, 'viewer');
  technician = await signInAs(t, 'technician');
});
afterAll(() => t?.close());

function send(agent: SignedInAgent, method: string, path: string) {
  const url = concretePath(path);
  const methods = { POST: agent.post(url), PUT: agent.put(url), PATCH: agent.patch(url), DELETE: agent.delete(url) };
  return methods[method as keyof typeof methods].send({});
}

describe('role enforcement over every route in the router stack', () => {
  it('finds the mutating routes (the enumeration itself works)', () => {
    const keys = listApiRoutes(t.app).map((route) => `${route.method} ${route.path}`);
    // The foundation's own routes must be found, or the loop below would prove nothing.
    expect(keys).toEqual(expect.arrayContaining([
      'POST /api/users', 'PATCH /api/users/:id', 'POST /api/batteries', 'PATCH /api/batteries/:id',
      'DELETE /api/batteries/:id', 'PUT /api/settings', 'PATCH /api/settings',
    ]));
  });

  it('answers 403 to a viewer on every mutating route that exists', async () => {
    const mutating = listApiRoutes(t.app).filter((route) => MUTATING.has(route.method) && !SELF_SERVICE.has(`${route.method} ${route.path}`));
    const wrong: string[] = [];
    for (const route of mutating) {
      const response = await send(viewer, route.method, route.path);
      if (response.status !== 403) wrong.push(`${route.method} ${route.path} → ${response.status}`);
    }
    expect(wrong).toEqual([]);
    await viewer.get('/api/auth/me').expect(200); // still signed in: the 403s were about the role
  });

  it('answers 403 to a technician on every user-management route', async () => {
    const userRoutes = listApiRoutes(t.app).filter((route) => route.path.startsWith('/api/users'));
    expect(userRoutes.length).toBeGreaterThanOrEqual(3);
    for (const route of userRoutes) {
      const response = route.method === 'GET' ? await technician.get(concretePath(route.path)) : await send(technician, route.method, route.path);
      expect(response.status, `${route.method} ${route.path}`).toBe(403);
    }
  });

  it('answers 401 (not 403 or 200) on every non-auth route when signed out', async () => {
    const { default: request } = await import('supertest');
    // Public on purpose: the health check, and shared reports (a made-up token answers 404).
    const isPublic = (path: string) => path === '/api/health' || path.startsWith('/api/shared/');
    const routes = listApiRoutes(t.app).filter((route) => !route.path.startsWith('/api/auth/'));
    for (const route of routes.filter((r) => r.method === 'GET')) {
      const response = await request(t.url).get(concretePath(route.path));
      if (route.path.startsWith('/api/shared/')) expect(response.status, `GET ${route.path}`).toBe(404);
      else if (!isPublic(route.path)) expect(response.status, `GET ${route.path}`).toBe(401);
    }
    expect(routes.filter((r) => r.path.startsWith('/api/shared/')).length).toBeGreaterThan(0);
  });
});
