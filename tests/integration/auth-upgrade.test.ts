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
    expect(isSameOrigin(upgradeRequest({ origin: `http://${host}` }), t.ctx.config)).toBe(true);
    expect(isSameOrigin(upgradeRequest({ origin: 'http://evil.example' }), t.ctx.config)).toBe(false);
    expect(isSameOrigin(upgradeRequest({}), t.ctx.config)).toBe(false);
  });

  it('compares the scheme too: an https page is not the origin of a plain http server, nor the reverse', () => {
    const host = new URL(t.url).host;
    expect(isSameOrigin(upgradeRequest({ origin: `https://${host}` }), t.ctx.config)).toBe(false);
    // Behind a trusted TLS proxy the request arrived as https: only an https origin matches.
    const behindProxy = { trustProxy: ['loopback'], allowedHosts: [] };
    const viaProxy = (headers: Record<string, string>) => {
      const req = upgradeRequest({ 'x-forwarded-proto': 'https', ...headers });
      Object.defineProperty(req.socket, 'remoteAddress', { value: '127.0.0.1' });
      return req;
    };
    expect(isSameOrigin(viaProxy({ origin: `https://${host}` }), behindProxy)).toBe(true);
    expect(isSameOrigin(viaProxy({ origin: `http://${host}` }), behindProxy)).toBe(false);
    // The same header from a peer that is not a trusted proxy is ignored.
    expect(isSameOrigin(viaProxy({ origin: `https://${host}` }), { trustProxy: ['10.0.0.5'], allowedHosts: [] })).toBe(false);
  });

  it('refuses a Host that is not one of the server names, even with a matching Origin (DNS rebinding)', () => {
    const rebound = upgradeRequest({ host: 'rebind.example:8080', origin: 'http://rebind.example:8080' });
    expect(isSameOrigin(rebound, t.ctx.config)).toBe(false);
    expect(isSameOrigin(rebound, { trustProxy: false, allowedHosts: ['rebind.example'] })).toBe(true);
  });
});
