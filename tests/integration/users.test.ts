import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, csrfAgent, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let admin: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  admin = await signInAs(t, 'admin');
});
afterAll(() => t?.close());

describe('user management (admin)', () => {
  it('lists users without password hashes', async () => {
    const response = await admin.get('/api/users').expect(200);
    const emails = response.body.users.map((user: { email: string }) => user.email);
    expect(emails).toEqual(expect.arrayContaining(Object.values(TEST_USERS).map((user) => user.email)));
    for (const user of response.body.users) expect(user).not.toHaveProperty('passwordHash');
  });

  it('creates a user who can then sign in with the role given', async () => {
    const created = await admin.post('/api/users')
      .send({ email: 'New.Tech@Test.Lab', name: 'New Tech', role: 'technician', password: 'first-password-1' }).expect(201);
    expect(created.body.user).toMatchObject({ email: 'new.tech@test.lab', role: 'technician', disabled: false });
    const agent = await signInAs(t, 'technician', { email: 'new.tech@test.lab', password: 'first-password-1' });
    expect(agent.user.role).toBe('technician');
  });

  it('refuses a second user with the same e-mail (409) and a short password (400)', async () => {
    const duplicate = await admin.post('/api/users')
      .send({ email: TEST_USERS.viewer.email, name: 'Again', role: 'viewer', password: 'long-enough-1' }).expect(409);
    expect(duplicate.body.error.fields).toHaveProperty('email');
    const short = await admin.post('/api/users').send({ email: 'short@test.lab', name: 'Short', role: 'viewer', password: 'short' }).expect(400);
    expect(short.body.error.fields).toHaveProperty('password');
  });

  it('sets a role, and the change applies to a session already open', async () => {
    const created = await admin.post('/api/users')
      .send({ email: 'promote@test.lab', name: 'Promote Me', role: 'viewer', password: 'promote-password' }).expect(201);
    const user = await signInAs(t, 'viewer', { email: 'promote@test.lab', password: 'promote-password' });
    const battery = { label: 'Role check', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20 };
    await user.post('/api/batteries').send(battery).expect(403);
    await admin.patch(`/api/users/${created.body.user.id}`).send({ role: 'technician' }).expect(200);
    await user.post('/api/batteries').send(battery).expect(201);
  });

  it('disables a user: their open session ends and they cannot sign in again', async () => {
    const created = await admin.post('/api/users')
      .send({ email: 'leaver@test.lab', name: 'Leaver', role: 'technician', password: 'leaver-password' }).expect(201);
    const leaver = await signInAs(t, 'technician', { email: 'leaver@test.lab', password: 'leaver-password' });
    await admin.patch(`/api/users/${created.body.user.id}`).send({ disabled: true }).expect(200);
    await leaver.get('/api/auth/me').expect(401);
    const again = await csrfAgent(t);
    await again.post('/api/auth/login').send({ email: 'leaver@test.lab', password: 'leaver-password' }).expect(401);
  });

  it('does not let an admin demote or disable themselves (no lock-out)', async () => {
    await admin.patch(`/api/users/${admin.user.id}`).send({ role: 'viewer' }).expect(409);
    await admin.patch(`/api/users/${admin.user.id}`).send({ disabled: true }).expect(409);
    await admin.get('/api/users').expect(200);
  });

  it('answers 404 for an unknown user and 400 for a non-numeric id or an unknown field', async () => {
    await admin.patch('/api/users/999999').send({ name: 'Ghost' }).expect(404);
    await admin.patch('/api/users/abc').send({ name: 'Ghost' }).expect(400);
    await admin.patch(`/api/users/${admin.user.id}`).send({ passwordHash: 'x' }).expect(400);
  });
});
