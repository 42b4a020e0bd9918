import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let admin: SignedInAgent;
let technician: SignedInAgent;
let viewer: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext({ attachments: [attachBenchManager] });
  [admin, technician, viewer] = await Promise.all([signInAs(t, 'admin'), signInAs(t, 'technician'), signInAs(t, 'viewer')]);
});
afterAll(() => t?.close());

const simulatorBench = {
  name: 'Bench 1 (simulated)',
  source: { kind: 'simulator', scenario: 'lfp-12v-100ah-cp-cutoff', speed: 50, seed: 3 },
  notes: 'Demo pack on a 600 W load',
};
const serialBench = {
  name: 'Bench 2 (USB meter)',
  source: { kind: 'serial', path: '/tmp/kneepoint-no-such-port', baudRate: 9600, format: { kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell'] } },
};

describe('/api/benches', () => {
  it('lets an admin create a simulator bench that starts streaming frames', async () => {
    const frames: Frame[] = [];
    const manager = t.ctx.services.benchManager!;
    const off = manager.onFrame((_id, frame) => frames.push(frame));
    const created = await admin.post('/api/benches').send(simulatorBench).expect(201);
    expect(created.body.bench).toMatchObject({ name: simulatorBench.name, enabled: true, source: { kind: 'simulator', speed: 50 } });
    const id = created.body.bench.id as number;
    await expect.poll(() => frames.length, { timeout: 5000 }).toBeGreaterThan(3);
    off();
    const got = await viewer.get(`/api/benches/${id}`).expect(200);
    expect(got.body.bench.status).toMatchObject({ state: 'receiving' });
    expect(got.body.bench.status.framesOk).toBeGreaterThan(3);
  });

  it('shows a serial bench on a missing port as reconnecting, with its reason', async () => {
    const created = await admin.post('/api/benches').send(serialBench).expect(201);
    await expect
      .poll(async () => (await technician.get(`/api/benches/${created.body.bench.id}`)).body.bench.status.state, { timeout: 5000 })
      .toBe('reconnecting');
    const list = await viewer.get('/api/benches').expect(200);
    const names = list.body.benches.map((b: { name: string }) => b.name);
    expect(names).toEqual([simulatorBench.name, serialBench.name]);
    const serial = list.body.benches[1];
    expect(serial.status.message).toMatch(/retrying in/);
  });

  it('refuses writes from technicians and viewers with 403', async () => {
    const list = await viewer.get('/api/benches').expect(200);
    const id = list.body.benches[0].id;
    await technician.post('/api/benches').send({ ...simulatorBench, name: 'x' }).expect(403);
    await viewer.post('/api/benches').send({ ...simulatorBench, name: 'y' }).expect(403);
    await technician.patch(`/api/benches/${id}`).send({ name: 'renamed' }).expect(403);
    await viewer.delete(`/api/benches/${id}`).expect(403);
    await technician.post(`/api/benches/${id}/restart`).expect(403);
    await technician.get('/api/benches/ports').expect(403);
  });

  it('answers 400 naming the bad field', async () => {
    const badBaud = await admin
      .post('/api/benches')
      .send({ ...serialBench, name: 'bad', source: { ...serialBench.source, baudRate: 'fast' } })
      .expect(400);
    expect(Object.keys(badBaud.body.error.fields)).toEqual(['source.baudRate']);
    const noAmps = await admin
      .post('/api/benches')
      .send({ name: 'bad2', source: { ...serialBench.source, format: { kind: 'csv', columns: ['t', 'volts'] } } })
      .expect(400);
    expect(noAmps.body.error.fields['source.format.columns']).toEqual(['columns must include volts and amps']);
    const badKind = await admin.post('/api/benches').send({ name: 'bad3', source: { kind: 'carrier-pigeon' } }).expect(400);
    expect(Object.keys(badKind.body.error.fields)).toEqual(['source.kind']);
    const badModbus = await admin
      .post('/api/benches')
      .send({ name: 'bad4', source: { kind: 'serial', path: '/tmp/x', format: { kind: 'modbus', unitId: 300, registers: { volts: { address: 0 }, amps: { address: 1, type: 'u64' } } } } })
      .expect(400);
    expect(Object.keys(badModbus.body.error.fields).sort()).toEqual(['source.format.registers.amps.type', 'source.format.unitId']);
    await admin.get('/api/benches/abc').expect(400);
    expect((await viewer.get('/api/benches').expect(200)).body.benches).toHaveLength(2); // nothing half-created
  });

  it('renames, refuses a duplicate name, restarts, disables and deletes', async () => {
    const list = await viewer.get('/api/benches').expect(200);
    const [sim, serial] = list.body.benches as { id: number; name: string }[];
    await admin.patch(`/api/benches/${sim!.id}`).send({ name: serial!.name }).expect(409);
    const renamed = await admin.patch(`/api/benches/${sim!.id}`).send({ name: 'Bench 1', notes: 'moved to rack B' }).expect(200);
    expect(renamed.body.bench).toMatchObject({ name: 'Bench 1', notes: 'moved to rack B' });
    await admin.post(`/api/benches/${sim!.id}/restart`).expect(200);
    const disabled = await admin.patch(`/api/benches/${serial!.id}`).send({ enabled: false }).expect(200);
    expect(disabled.body.bench.status).toMatchObject({ state: 'idle', message: 'bench disabled' });
    await admin.post(`/api/benches/${serial!.id}/restart`).expect(200);
    await admin.delete(`/api/benches/${serial!.id}`).expect(204);
    await viewer.get(`/api/benches/${serial!.id}`).expect(404);
    expect(t.ctx.services.benchManager!.benchIds()).toEqual([sim!.id]);
  });

  it('lists serial ports for admins, or says why it cannot', async () => {
    const response = await admin.get('/api/benches/ports').expect(200);
    expect(Array.isArray(response.body.ports)).toBe(true);
    if (response.body.ports.length === 0) expect(response.body.message).toMatch(/path/);
  });
});
