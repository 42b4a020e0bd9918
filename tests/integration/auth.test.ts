import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestContext, csrfAgent, signInAs, TEST_LOGIN_MAX_FAILURES, TEST_PASSWORD, TEST_USERS, type TestContext } from './helpers/index.js';

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

describe('sign-in', () => {
  it('signs in with e-mail and password and answers the user and a fresh CSRF token', async () => {
    const agent = await csrfAgent(t);
    const response = await agent.post('/api/auth/login').send({ email: TEST_USERS.technician.email, password: TEST_PASSWORD }).expect(200);
    expect(response.body.user).toMatchObject({ email: TEST_USERS.technician.email, role: 'technician' });
    expect(response.body.user).not.toHaveProperty('passwordHash');
    expect(response.body.csrfToken).not.toBe(agent.csrfToken); // the session was regenerated
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.email).toBe(TEST_USERS.technician.email);
  });

  it('accepts the e-mail in any letter case', async () => {
    const agent = await csrfAgent(t);
    await agent.post('/api/auth/login').send({ email: TEST_USERS.viewer.email.toUpperCase(), password: TEST_PASSWORD }).expect(200);
  });

  it('sets an HttpOnly, SameSite=Lax session cookie', async () => {
    const agent = await csrfAgent(t);
    const response = await agent.post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(200);
    const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? []).find((c) => c.startsWith('kneepoint.sid='));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('answers 401 for a wrong password and for an unknown e-mail, with the same message', async () => {
    const agent = await csrfAgent(t);
    const wrong = await agent.post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: 'not-the-password' }).expect(401);
    const unknown = await agent.post('/api/auth/login').send({ email: 'nobody@test.lab', password: 'not-the-password' }).expect(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
    await agent.get('/api/auth/me').expect(401);
  });

  it('answers who is signed in on /api/auth/session: null when signed out, never a failed request', async () => {
    expect((await request(t.url).get('/api/auth/session').expect(200)).body).toEqual({ user: null });
    const agent = await csrfAgent(t);
    await agent.post('/api/auth/login').send({ email: TEST_USERS.viewer.email, password: TEST_PASSWORD }).expect(200);
    const signedIn = (await agent.get('/api/auth/session').expect(200)).body.user;
    expect(signedIn).toMatchObject({ email: TEST_USERS.viewer.email, role: 'viewer' });
    expect(signedIn.passwordHash).toBeUndefined();
  });

  it('answers 401 on /api/auth/me when signed out', async () => {
    const response = await request(t.url).get('/api/auth/me').expect(401);
    expect(response.body.error.message).toMatch(/sign in/i);
  });

  it('ends the session on logout: the old cookie no longer signs in', async () => {
    const agent = await csrfAgent(t);
    const login = await agent.post('/api/auth/login').send({ email: TEST_USERS.viewer.email, password: TEST_PASSWORD }).expect(200);
    agent.set('X-CSRF-Token', login.body.csrfToken);
    const sessionCookie = ([] as string[]).concat(login.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).find((c) => c.startsWith('kneepoint.sid='));
    expect(sessionCookie).toBeDefined();
    await request(t.url).get('/api/auth/me').set('Cookie', sessionCookie!).expect(200);
    await agent.post('/api/auth/logout').expect(204);
    await agent.get('/api/auth/me').expect(401);
    // Replaying the pre-logout cookie must not work either: the row is gone from the store.
    await request(t.url).get('/api/auth/me').set('Cookie', sessionCookie!).expect(401);
  });

  it('lets a user change their own password, and only with the current one', async () => {
    const agent = await signInAs(t, 'technician');
    await agent.post('/api/auth/password').send({ currentPassword: 'wrong-current', newPassword: 'a-new-password-1' }).expect(400);
    await agent.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'a-new-password-1' }).expect(204);
    const fresh = await csrfAgent(t);
    await fresh.post('/api/auth/login').send({ email: TEST_USERS.technician.email, password: TEST_PASSWORD }).expect(401);
    await fresh.post('/api/auth/login').send({ email: TEST_USERS.technician.email, password: 'a-new-password-1' }).expect(200);
    await agent.post('/api/auth/password').send({ currentPassword: 'a-new-password-1', newPassword: TEST_PASSWORD }).expect(204);
  });
});

describe('CSRF protection', () => {
  it('refuses a state-changing request without the token (403) and with a wrong one', async () => {
    const admin = await signInAs(t, 'admin');
    const body = { label: 'No token', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10 };
    const missing = await admin.post('/api/batteries').unset('X-CSRF-Token').send(body).expect(403);
    expect(missing.body.error.message).toMatch(/CSRF/);
    await admin.post('/api/batteries').set('X-CSRF-Token', 'forged').send(body).expect(403);
    await admin.post('/api/batteries').send(body).expect(201);
  });

  it('refuses a login without the token', async () => {
    await request(t.url).post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(403);
  });

  it("does not accept another session's token", async () => {
    const viewer = await signInAs(t, 'viewer');
    const admin = await signInAs(t, 'admin');
    await admin.post('/api/users').set('X-CSRF-Token', viewer.csrfToken)
      .send({ email: 'x@test.lab', name: 'X', role: 'viewer', password: 'long-enough-pw' }).expect(403);
  });
});

describe('security headers', () => {
  it('sends a CSP limited to our own origin, and no X-Powered-By', async () => {
    const response = await request(t.url).get('/api/auth/csrf').expect(200);
    const csp = response.headers['content-security-policy'];
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    expect(response.headers['x-powered-by']).toBeUndefined();
  });
});

describe('login rate limiting', () => {
  it(`answers 429 after ${TEST_LOGIN_MAX_FAILURES} failed sign-ins, even with the right password`, async () => {
    const limited = await createTestContext({ users: true });
    try {
      const agent = await csrfAgent(limited);
      for (let attempt = 0; attempt < TEST_LOGIN_MAX_FAILURES; attempt += 1) {
        await agent.post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: `wrong-${attempt}` }).expect(401);
      }
      const blocked = await agent.post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(429);
      expect(blocked.body.error.message).toMatch(/too many/i);
    } finally {
      await limited.close();
    }
  });

  it('locks one account from one address, not every user behind that address', async () => {
    const limited = await createTestContext({ users: true });
    try {
      const attacker = await csrfAgent(limited);
      for (let attempt = 0; attempt < TEST_LOGIN_MAX_FAILURES; attempt += 1) {
        await attacker.post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: `wrong-${attempt}` }).expect(401);
      }
      // Hammering the locked account does not use up the address's allowance.
      for (let attempt = 0; attempt < 4 * TEST_LOGIN_MAX_FAILURES; attempt += 1) {
        await attacker.post('/api/auth/login').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(429);
      }
      // A colleague behind the same address signs in at once.
      await signInAs(limited, 'technician');
      await signInAs(limited, 'viewer');
    } finally {
      await limited.close();
    }
  });

  it(`bounds parallel guesses of the current password: at most ${TEST_LOGIN_MAX_FAILURES} are checked`, async () => {
    const limited = await createTestContext({ users: true });
    try {
      const tech = await signInAs(limited, 'technician');
      const guesses = 40;
      const answers = await Promise.all(
        Array.from({ length: guesses }, (_, i) => tech.post('/api/auth/password').send({ currentPassword: `guess-${i}-wrong`, newPassword: 'a-new-password-1' })),
      );
      const statuses = answers.map((a) => a.status);
      expect(statuses.filter((s) => s === 400)).toHaveLength(TEST_LOGIN_MAX_FAILURES);
      expect(statuses.filter((s) => s === 429)).toHaveLength(guesses - TEST_LOGIN_MAX_FAILURES);
      expect(answers.find((a) => a.status === 429)!.body.error.message).toMatch(/too many/i);
      // The right current password is refused too until the window passes: guessing stays closed.
      await tech.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'a-new-password-1' }).expect(429);
      // Other users are not held up: their sign-in and password change still work.
      const viewer = await signInAs(limited, 'viewer');
      await viewer.post('/api/auth/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'a-new-password-2' }).expect(204);
    } finally {
      await limited.close();
    }
  });
});


describe('host names and proxies', () => {
  it('answers only to loopback names by default, and to the configured public names', async () => {
    await request(t.url).get('/api/auth/csrf').set('Host', 'rebind.example').expect(400);
    await request(t.url).get('/').set('Host', 'rebind.example:8080').expect(400);
    await request(t.url).get('/api/auth/csrf').set('Host', 'localhost:8080').expect(200);
    await request(t.url).get('/api/auth/csrf').set('Host', '[::1]:8080').expect(200);
    const named = await createTestContext({ users: false, config: { allowedHosts: ['lab.example.org', 'bench-pc:8443'] } });
    try {
      await request(named.url).get('/api/auth/csrf').set('Host', 'LAB.example.org').expect(200);
      await request(named.url).get('/api/auth/csrf').set('Host', 'bench-pc:8443').expect(200);
      await request(named.url).get('/api/auth/csrf').set('Host', 'bench-pc:9000').expect(400);
      const refused = await request(named.url).get('/api/auth/csrf').set('Host', 'evil.example').expect(400);
      expect(refused.body.error.message).toMatch(/KNEEPOINT_ALLOWED_HOSTS/);
    } finally {
      await named.close();
    }
  });

  const lockFrom = async (target: TestContext, forwardedFor: string) => {
    const agent = await csrfAgent(target);
    for (let attempt = 0; attempt < TEST_LOGIN_MAX_FAILURES; attempt += 1) {
      await agent.post('/api/auth/login').set('X-Forwarded-For', forwardedFor).send({ email: TEST_USERS.admin.email, password: `wrong-${attempt}` }).expect(401);
    }
  };

  it('behind a trusted proxy, a lockout holds for the attacking client address only', async () => {
    const proxied = await createTestContext({ users: true, config: { trustProxy: ['loopback'] } });
    try {
      await lockFrom(proxied, '203.0.113.7');
      const agent = await csrfAgent(proxied);
      await agent.post('/api/auth/login').set('X-Forwarded-For', '203.0.113.7').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(429);
      await agent.post('/api/auth/login').set('X-Forwarded-For', '198.51.100.20').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(200);
    } finally {
      await proxied.close();
    }
  });

  it('without trust proxy, a forged X-Forwarded-For does not escape the lockout', async () => {
    const direct = await createTestContext({ users: true });
    try {
      await lockFrom(direct, '203.0.113.7');
      const agent = await csrfAgent(direct);
      await agent.post('/api/auth/login').set('X-Forwarded-For', '198.51.100.20').send({ email: TEST_USERS.admin.email, password: TEST_PASSWORD }).expect(429);
    } finally {
      await direct.close();
    }
  });
});
