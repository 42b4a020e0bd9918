import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { IncomingMessage } from 'node:http';
import { Socket } from 'node:net';
import { createTestContext, csrfAgent, TEST_PASSWORD, TEST_USERS, type TestContext } from './helpers/index.js';
import { isSameOrigin, sessionUserFromRequest } from '../../server/auth/upgrade-auth.js';

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

/** A raw request like the one `ws` hands to an upgrade handler. */
function upgradeRequest(headers: Record<string, string>): IncomingMessage {
  const req = new IncomingMessage(new Socket());
  req.url = '/ws';
  req.method = 'GET';
  req.headers = { host: new URL(t.url).host, ...headers };
  return req;
}

async function signedInCookie(role: keyof typeof TEST_USERS): Promise<string> {
  const agent = await csrfAgent(t);
  const login = await agent.post('/api/auth/login').send({ email: TEST_USERS[role].email, password: TEST_PASSWORD }).expect(200);
  const cookie = ([] as string[]).concat(login.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).find((c) => c.startsWith('kneepoint.sid='));
  if (!cookie) throw new Error('no session cookie');
  return cookie;
}

describe('WebSocket upgrade authentication', () => {
  it('reads the signed-in user from the same session cookie', async () => {
    const cookie = await signedInCookie('technician');
    const user = await sessionUserFromRequest(t.ctx, upgradeRequest({ cookie }));
    expect(user).toMatchObject({ email: TEST_USERS.technician.email, role: 'technician' });
  });

  it('answers null without a cookie, with a forged cookie, and after logout', async () => {
    expect(await sessionUserFromRequest(t.ctx, upgradeRequest({}))).toBeNull();
    expect(await sessionUserFromRequest(t.ctx, upgradeRequest({ cookie: 'kneepoint.sid=s%3Aforged.signature' }))).toBeNull();
    const agent = await csrfAgent(t);
    const login = await agent.post('/api/auth/login').send({ email: TEST_USERS.viewer.email, password: TEST_PASSWORD }).expect(200);
    const cookie = ([] as string[]).concat(login.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).find((c) => c.startsWith('kneepoint.sid='))!;
    expect(await sessionUserFromRequest(t.ctx, upgradeRequest({ cookie }))).not.toBeNull();
    await agent.post('/api/auth/logout').set('X-CSRF-Token', login.body.csrfToken).expect(204);
    expect(await sessionUserFromRequest(t.ctx, upgradeRequest({ cookie }))).toBeNull();
  });

  it('accepts only our own Origin', () => {
    const host = new URL(t.url).host;
    expect(isSameOrigin(upgradeRequest({ origin: `http://${host}` }))).toBe(true);
    expect(isSameOrigin(upgradeRequest({ origin: 'http://evil.example' }))).toBe(false);
    expect(isSameOrigin(upgradeRequest({}))).toBe(false);
  });
});
