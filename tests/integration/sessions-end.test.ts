import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { liveAttachment } from '../../server/live/attach-live.js';
import { SESSION_ENDED_CODE } from '../../server/live/ws-server.js';
import { createTestContext, csrfAgent, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { ManualFeed, tempSpillDir, WsProbe } from './runs-kit.js';

let t: TestContext;
let admin: SignedInAgent;
const probes: WsProbe[] = [];
beforeAll(async () => {
  t = await createTestContext({ attachments: [liveAttachment({ feed: new ManualFeed(), spillDir: tempSpillDir() })] });
  admin = await signInAs(t, 'admin');
});
afterAll(async () => {
  for (const p of probes) p.close();
  await t?.close();
});

async function newUser(email: string, password: string): Promise<number> {
  const created = await admin.post('/api/users').send({ email, name: 'Session Test', role: 'technician', password }).expect(201);
  return created.body.user.id as number;
}
const login = (email: string, password: string) => signInAs(t, 'technician', { email, password });
/** Signs in on a fresh session and opens a WebSocket with its cookie. */
async function socket(email: string, password: string): Promise<WsProbe> {
  const agent = await csrfAgent(t);
  const res = await agent.post('/api/auth/login').send({ email, password }).expect(200);
  const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]!).find((c) => c.startsWith('kneepoint.sid='));
  const p = await WsProbe.open(t, cookie);
  probes.push(p);
  await p.next('hello');
  return p;
}
const closed = (p: WsProbe) => new Promise<number>((resolve) => (p.ws.readyState === p.ws.CLOSED ? resolve(-1) : p.ws.once('close', (code) => resolve(code))));

describe('ending sessions', () => {
  it('signing out closes the sockets opened with that session, and only those', async () => {
    await newUser('leaving-tab@test.lab', 'tab-password-1');
    const agent = await csrfAgent(t);
    const res = await agent.post('/api/auth/login').send({ email: 'leaving-tab@test.lab', password: 'tab-password-1' }).expect(200);
    agent.set('X-CSRF-Token', res.body.csrfToken);
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]!).find((c) => c.startsWith('kneepoint.sid='));
    const tab = await WsProbe.open(t, cookie);
    probes.push(tab);
    await tab.next('hello');
    const otherDevice = await socket('leaving-tab@test.lab', 'tab-password-1');
    const tabClosed = closed(tab);
    await agent.post('/api/auth/logout').expect(204);
    expect(await tabClosed).toBe(SESSION_ENDED_CODE);
    otherDevice.send({ type: 'ping', id: 5 });
    expect((await otherDevice.next('pong')).id).toBe(5);
  });

  it('a password change signs out the other sessions and sockets of that user, not the one that changed it', async () => {
    await newUser('mover@test.lab', 'first-password-1');
    const here = await login('mover@test.lab', 'first-password-1');
    const elsewhere = await login('mover@test.lab', 'first-password-1');
    const otherSocket = await socket('mover@test.lab', 'first-password-1');
    const otherClosed = closed(otherSocket);
    await here.post('/api/auth/password').send({ currentPassword: 'first-password-1', newPassword: 'second-password-2' }).expect(204);
    await here.get('/api/auth/me').expect(200);
    await elsewhere.get('/api/auth/me').expect(401);
    expect(await otherClosed).toBe(SESSION_ENDED_CODE);
    // Other users keep their sessions.
    await admin.get('/api/auth/me').expect(200);
  });

  it('disabling a user ends their sessions and sockets for good, even if re-enabled', async () => {
    const id = await newUser('leaver2@test.lab', 'leaver-password-1');
    const agent = await login('leaver2@test.lab', 'leaver-password-1');
    const ws = await socket('leaver2@test.lab', 'leaver-password-1');
    const wsClosed = closed(ws);
    await admin.patch(`/api/users/${id}`).send({ disabled: true }).expect(200);
    expect(await wsClosed).toBe(SESSION_ENDED_CODE);
    await admin.patch(`/api/users/${id}`).send({ disabled: false }).expect(200);
    await agent.get('/api/auth/me').expect(401);
    await login('leaver2@test.lab', 'leaver-password-1');
    await admin.get('/api/auth/me').expect(200);
  });
});
