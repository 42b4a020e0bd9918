import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { DEMO_BATTERIES } from '../../server/db/seed-demo.js';

let t: TestContext;
let technician: SignedInAgent;
let viewer: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext({ demo: true });
  technician = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
});
afterAll(() => t?.close());

// Invented demo figures (a fictional 13s NMC e-scooter pack).
const pack = {
  label: 'Kestrel scooter 48 V', brand: 'Kestrel Energy', model: 'Glide 48-12', chemistry: 'nmc',
  cellsInSeries: 13, cellsInParallel: 4, ratedAh: 12, ratedWh: 562, bmsRatedAmps: 30, massKg: 3.4,
  price: 310, priceCurrency: 'EUR', serialNumber: 'KE-G48-0099', sender: 'Canal Street Repairs',
};

describe('batteries', () => {
  it('lists the seeded demo packs to a viewer', async () => {
    const response = await viewer.get('/api/batteries').expect(200);
    const labels = response.body.batteries.map((battery: { label: string }) => battery.label);
    expect(labels).toEqual(expect.arrayContaining(DEMO_BATTERIES.map((battery) => battery.label)));
    // The heated demo pack keeps its stated protections; the others state none.
    const heated = response.body.batteries.find((battery: { label: string }) => battery.label === 'Corvane heated 48 V');
    expect(heated.protectionSpecs.map((s: { protection: string }) => s.protection)).toEqual(['cold-charge', 'heater-on', 'heater-off', 'over-temp-discharge', 'low-voltage', 'over-current']);
    const plain = response.body.batteries.find((battery: { label: string }) => battery.label === 'Hollis standby 12 V');
    expect(plain.protectionSpecs).toEqual([]);
    const record = await viewer.get(`/api/batteries/${heated.id}/protections`).expect(200);
    expect(record.body).toMatchObject({ batteryId: heated.id, rows: [] });
    expect(record.body.specs).toHaveLength(6);
  });

  it('lets a technician create, read, change and delete a pack', async () => {
    const created = await technician.post('/api/batteries').send(pack).expect(201);
    const id = created.body.battery.id;
    expect(created.body.battery).toMatchObject({ ...pack, notes: null });
    const read = await viewer.get(`/api/batteries/${id}`).expect(200);
    expect(read.body.battery.serialNumber).toBe(pack.serialNumber);
    const changed = await technician.patch(`/api/batteries/${id}`).send({ ratedAh: 11.5, notes: 'Swollen cell group 7' }).expect(200);
    expect(changed.body.battery).toMatchObject({ ratedAh: 11.5, notes: 'Swollen cell group 7', label: pack.label, cellsInParallel: 4 });
    await technician.delete(`/api/batteries/${id}`).expect(204);
    await viewer.get(`/api/batteries/${id}`).expect(404);
  });

  it('stores optional fields left out as null', async () => {
    const minimal = { label: 'Bare cell', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 1, ratedAh: 3.2 };
    const created = await technician.post('/api/batteries').send(minimal).expect(201);
    expect(created.body.battery).toMatchObject({ ...minimal, cellsInParallel: 1, ratedWh: null, massKg: null, serialNumber: null });
  });

  it('rejects impossible values with the field names', async () => {
    const response = await technician.post('/api/batteries')
      .send({ ...pack, chemistry: 'unobtainium', cellsInSeries: 0, ratedAh: -5, priceCurrency: 'euro' }).expect(400);
    expect(Object.keys(response.body.error.fields)).toEqual(expect.arrayContaining(['chemistry', 'cellsInSeries', 'ratedAh', 'priceCurrency']));
    await technician.patch('/api/batteries/1').send({}).expect(400);
  });

  it('refuses writes from a viewer', async () => {
    await viewer.post('/api/batteries').send(pack).expect(403);
    await viewer.patch('/api/batteries/1').send({ ratedAh: 1 }).expect(403);
    await viewer.delete('/api/batteries/1').expect(403);
    await viewer.get('/api/batteries/1').expect(200);
  });
});
