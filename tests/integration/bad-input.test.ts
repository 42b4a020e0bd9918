import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import express from 'express';
import request from 'supertest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { createErrorHandler } from '../../server/http/error-handler.js';
import { quietLogger } from '../../server/log/logger.js';

const BODY_LIMIT_BYTES = 100 * 1024; // testConfig's bodyLimit is 100kb
const STACK_LINE = /\n\s+at .+\(.+:\d+:\d+\)/;

let t: TestContext;
let technician: SignedInAgent;
let admin: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  technician = await signInAs(t, 'technician');
  admin = await signInAs(t, 'admin');
});
afterAll(() => t?.close());

/** Every error answer is JSON `{ error: { message } }`, 4xx, with no stack trace in it. */
function expectCleanClientError(response: request.Response, status: number, message: RegExp) {
  expect(response.status).toBe(status);
  expect(response.headers['content-type']).toMatch(/application\/json/);
  expect(response.body.error.message).toMatch(message);
  expect(response.text).not.toMatch(STACK_LINE);
}

describe('bad input gets a clear 4xx, never a 500 or a stack trace', () => {
  it('malformed JSON → 400', async () => {
    const response = await technician.post('/api/batteries').set('Content-Type', 'application/json').send('{"label": "Voltara",');
    expectCleanClientError(response, 400, /malformed json/i);
  });

  it('missing fields → 400 naming each field', async () => {
    const response = await technician.post('/api/batteries').send({ label: 'Only a label' });
    expectCleanClientError(response, 400, /invalid request/i);
    expect(Object.keys(response.body.error.fields)).toEqual(expect.arrayContaining(['brand', 'chemistry', 'cellsInSeries', 'ratedAh']));
  });

  it('wrong types and a JSON array instead of an object → 400', async () => {
    const wrongTypes = await technician.post('/api/batteries')
      .send({ label: 5, brand: 'Voltara', chemistry: 'lfp', cellsInSeries: '16', ratedAh: 'lots' });
    expectCleanClientError(wrongTypes, 400, /invalid request/i);
    expect(Object.keys(wrongTypes.body.error.fields)).toEqual(expect.arrayContaining(['label', 'cellsInSeries', 'ratedAh']));
    expectCleanClientError(await technician.post('/api/batteries').send([1, 2, 3]), 400, /invalid request/i);
  });

  it('a body that is not JSON at all → 400 (fields missing), not 500', async () => {
    const response = await technician.post('/api/batteries').set('Content-Type', 'text/plain').send('label=Voltara');
    expectCleanClientError(response, 400, /invalid request/i);
  });

  it('oversized body → 413', async () => {
    const notes = 'x'.repeat(BODY_LIMIT_BYTES + 1);
    const response = await technician.post('/api/batteries').send({ label: 'Big', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 1, ratedAh: 1, notes });
    expectCleanClientError(response, 413, /too large/i);
    await technician.get('/api/auth/me').expect(200); // the server is fine afterwards
  });

  it('an over-long password at login, a bad e-mail, and a bad id → 400', async () => {
    const { csrfAgent } = await import('./helpers/index.js');
    const anonymous = await csrfAgent(t);
    expectCleanClientError(await anonymous.post('/api/auth/login').send({ email: 'a@test.lab', password: 'p'.repeat(5000) }), 400, /invalid request/i);
    expectCleanClientError(await anonymous.post('/api/auth/login').send({ email: 'not-an-email', password: 'whatever' }), 400, /invalid request/i);
    expectCleanClientError(await technician.get('/api/batteries/-3'), 400, /invalid id/i);
    expectCleanClientError(await admin.patch('/api/users/1.5').send({ name: 'x' }), 400, /invalid id/i);
  });

  it('an id written any way but plain digits (hex, exponent, decimal point, padding) → 400', async () => {
    for (const id of ['0x1', '1e0', '1.0', '%201', '01', '+1']) expectCleanClientError(await technician.get(`/api/batteries/${id}`), 400, /invalid id/i);
  });

  it('an unknown /api route → 404 JSON', async () => {
    expectCleanClientError(await technician.get('/api/no-such-thing'), 404, /no api route/i);
    expectCleanClientError(await technician.post('/api/no-such-thing').send({}), 404, /no api route/i);
  });

  it('nothing recorded is lost: a rejected write leaves the list as it was', async () => {
    const before = (await technician.get('/api/batteries').expect(200)).body.batteries.length;
    await technician.post('/api/batteries').send({ label: 'Half', brand: 'Voltara' }).expect(400);
    await technician.post('/api/batteries').set('Content-Type', 'application/json').send('{oops').expect(400);
    const after = (await technician.get('/api/batteries').expect(200)).body.batteries.length;
    expect(after).toBe(before);
  });
});

describe('the error handler on an unexpected failure', () => {
  it('answers 500 with a generic message and logs the detail server-side only', async () => {
    const logged: unknown[] = [];
    const app = express();
    app.get('/boom', () => {
      throw new Error('secret detail: db password is hunter2');
    });
    app.use(createErrorHandler({ ...quietLogger, error: (_message, error) => void logged.push(error) }));
    const response = await request(app).get('/boom').expect(500);
    expect(response.body).toEqual({ error: { message: 'Internal server error' } });
    expect(response.text).not.toMatch(/hunter2|secret detail/);
    expect(logged).toHaveLength(1);
    // The log gets the error object itself, stack and all, not its text.
    expect(logged[0]).toBeInstanceOf(Error);
    expect((logged[0] as Error).stack).toMatch(/secret detail[\s\S]*\n\s+at /);
  });
});

describe('labels refuse control characters; settings refuse unknown keys at any depth', () => {
  const nulOnly = '\u0000\u0000';

  it('a NUL-only or control-laden label is refused in every label-like field', async () => {
    const battery = { brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10 };
    for (const body of [
      { ...battery, label: nulOnly },
      { ...battery, label: 'Pack\u001b[2JA' },
      { ...battery, label: 'Pack A', brand: '\u0000' },
      { ...battery, label: 'Pack A', model: 'M\u0000' },
      { ...battery, label: 'Pack A', notes: 'ok\u0000' },
    ]) {
      const response = await technician.post('/api/batteries').send(body);
      expectCleanClientError(response, 400, /invalid request/i);
    }
    const bench = await admin.post('/api/benches').send({ name: nulOnly, source: { kind: 'none' } });
    expectCleanClientError(bench, 400, /invalid request/i);
    expect(Object.keys(bench.body.error.fields)).toContain('name');
    const user = await admin.post('/api/users').send({ email: 'nul@test.lab', name: '\u200B', role: 'viewer', password: 'long-enough-pw' });
    expect(Object.keys(user.body.error.fields)).toContain('name');
    const lab = await admin.patch('/api/settings').send({ labName: nulOnly });
    expect(Object.keys(lab.body.error.fields)).toContain('labName');
    // Ordinary labels with accents and symbols still go through.
    await technician.post('/api/batteries').send({ ...battery, label: 'Zelle Ø18 µΩ', model: '', notes: 'line one\nline two' }).expect(201);
  });

  it('an unknown nested key in the settings PATCH is a 400 naming the key, and nothing is saved', async () => {
    const before = (await admin.get('/api/settings').expect(200)).body.settings;
    const response = await admin.patch('/api/settings').send({ endVoltsPerCell: { lfp: 2.6, lfpp: 2.4 } });
    expectCleanClientError(response, 400, /invalid request/i);
    expect(response.body.error.fields).toEqual({ 'endVoltsPerCell.lfpp': ['unknown field'] });
    const top = await admin.put('/api/settings').send({ labName: 'X', colour: 'red' });
    expect(top.body.error.fields).toEqual({ colour: ['unknown field'] });
    expect((await admin.get('/api/settings').expect(200)).body.settings).toEqual(before);
  });
});
