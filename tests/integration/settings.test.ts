import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let admin: SignedInAgent;
let technician: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  admin = await signInAs(t, 'admin');
  technician = await signInAs(t, 'technician');
});
afterAll(() => t?.close());

describe('lab settings', () => {
  it('answers defaults before anything is saved', async () => {
    const response = await technician.get('/api/settings').expect(200);
    // End voltages per cell: common practice, from memory (LFP 2.5 V, NMC 3.0 V, lead-acid 1.75 V, NiMH 1.0 V).
    expect(response.body.settings.endVoltsPerCell).toMatchObject({ lfp: 2.5, nmc: 3.0, 'lead-acid': 1.75, nimh: 1.0 });
    expect(response.body.settings).toMatchObject({ temperatureUnit: 'C', energyUnit: 'Wh', timeZone: 'UTC' });
  });

  it('lets an admin merge a change (PATCH) without losing the other values', async () => {
    await admin.patch('/api/settings').send({ timeZone: 'Europe/Oslo', endVoltsPerCell: { lfp: 2.7 } }).expect(200);
    const response = await technician.get('/api/settings').expect(200);
    expect(response.body.settings.timeZone).toBe('Europe/Oslo');
    expect(response.body.settings.endVoltsPerCell).toMatchObject({ lfp: 2.7, nmc: 3.0 });
  });

  it('lets an admin replace the document (PUT); missing keys take defaults', async () => {
    await admin.put('/api/settings').send({ labName: 'Harbour Cell Lab', acceptancePercent: 90, temperatureUnit: 'F' }).expect(200);
    const response = await technician.get('/api/settings').expect(200);
    expect(response.body.settings).toMatchObject({ labName: 'Harbour Cell Lab', acceptancePercent: 90, temperatureUnit: 'F', timeZone: 'UTC' });
    expect(response.body.settings.endVoltsPerCell.lfp).toBe(2.5);
  });

  it('rejects bad values with field names and keeps the stored document', async () => {
    const bad = await admin.patch('/api/settings').send({ timeZone: 'Mars/Olympus', acceptancePercent: 150, colour: 'red' }).expect(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['timeZone', 'acceptancePercent']));
    const response = await technician.get('/api/settings').expect(200);
    expect(response.body.settings.labName).toBe('Harbour Cell Lab');
  });

  it('refuses changes from a technician', async () => {
    await technician.put('/api/settings').send({ labName: 'Hijacked' }).expect(403);
    await technician.patch('/api/settings').send({ labName: 'Hijacked' }).expect(403);
  });
});
