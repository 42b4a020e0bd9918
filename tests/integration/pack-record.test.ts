import { fileURLToPath } from 'node:url';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BatterySchema } from '../../shared/schemas/battery.js';
import { InspectionResponseSchema } from '../../shared/schemas/inspection.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

const NASA_CSV = fileURLToPath(new URL('../fixtures/nasa-pcoe-b0005-discharge-cycle1.csv', import.meta.url));
let t: TestContext;
let tech: SignedInAgent;
let admin: SignedInAgent;
let viewer: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  [tech, admin, viewer] = await Promise.all([signInAs(t, 'technician'), signInAs(t, 'admin'), signInAs(t, 'viewer')]);
});
afterAll(() => t?.close());

// Invented demo figures (a fictional 16s LFP home-storage pack).
const pack = {
  label: 'NG-0190', brand: 'Harlow Storage', chemistry: 'lfp', cellsInSeries: 16, ratedAh: 100, ratedWh: 5120,
  price: 1480, priceCurrency: 'EUR', notes: 'Arrived with a dented corner', receivedOn: '2026-11-28', owner: 'Brookside Installers',
  lengthMm: 480, widthMm: 410, heightMm: 190, terminalType: 'M8 studs', statedCycleLife: 6000, warrantyMonths: 120,
};

describe('register fields', () => {
  it('stores the fields a lab needs and answers them in the API shape', async () => {
    const created = (await tech.post('/api/batteries').send(pack).expect(201)).body.battery;
    expect(BatterySchema.parse(created)).toMatchObject(pack);
    const changed = (await tech.patch(`/api/batteries/${created.id}`).send({ warrantyMonths: 60, owner: null }).expect(200)).body.battery;
    expect(changed).toMatchObject({ warrantyMonths: 60, owner: null, receivedOn: '2026-11-28' });
  });

  it('refuses impossible register values with their field names', async () => {
    const res = await tech.post('/api/batteries').send({ ...pack, receivedOn: '2026-02-31x', lengthMm: -1, statedCycleLife: 2.5, warrantyMonths: 10_000 }).expect(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['receivedOn', 'lengthMm', 'statedCycleLife', 'warrantyMonths']));
  });

  it('exports the register as CSV with units in the header', async () => {
    const res = await viewer.get('/api/batteries/export.csv').expect(200).expect('Content-Type', /text\/csv/);
    const rows = parse(res.text, { columns: true }) as Record<string, string>[];
    const row = rows.find((r) => r.label === pack.label)!;
    expect(row).toMatchObject({ 'rated capacity [Ah]': '100', 'length [mm]': '480', 'warranty [months]': '60', 'owner or client': '', 'price currency': 'EUR' });
  });
});

describe('linking a run to a pack afterwards', () => {
  it('files an imported run under a pack; a viewer cannot; unknown runs are 404', async () => {
    const battery = (await tech.post('/api/batteries').send({ label: 'B0005 again', brand: 'Hollis Power', chemistry: 'nca', cellsInSeries: 1, ratedAh: 2 }).expect(201)).body.battery;
    const imported = (await tech.post('/api/runs/import').field('name', 'Unfiled log').field('endVolts', '2.7').attach('file', NASA_CSV).expect(201)).body;
    const runId = imported.run.id as number;
    expect((await viewer.get(`/api/runs/${runId}`).expect(200)).body.run.batteryId).toBeNull();
    await viewer.put(`/api/batteries/${battery.id}/runs/${runId}`).expect(403);
    const linked = (await tech.put(`/api/batteries/${battery.id}/runs/${runId}`).expect(200)).body.run;
    expect(linked.batteryId).toBe(battery.id);
    const listed = (await viewer.get(`/api/runs?batteryId=${battery.id}`).expect(200)).body.runs.map((r: { id: number }) => r.id);
    expect(listed).toEqual([runId]);
    await tech.put(`/api/batteries/${battery.id}/runs/999999`).expect(404);
    // A run still recording keeps its pack: the recorder judges it against that pack's rating.
    const other = (await tech.post('/api/batteries').send({ ...pack, label: 'NG-0192' }).expect(201)).body.battery;
    await t.ctx.sequelize.query("UPDATE runs SET state = 'recording' WHERE id = ?", { replacements: [runId] });
    await tech.put(`/api/batteries/${other.id}/runs/${runId}`).expect(409);
    expect((await viewer.get(`/api/runs/${runId}`).expect(200)).body.run.batteryId).toBe(battery.id);
    await t.ctx.sequelize.query("UPDATE runs SET state = 'finished' WHERE id = ?", { replacements: [runId] });
    await tech.put(`/api/batteries/999999/runs/${runId}`).expect(404);
  });
});

describe('teardown inspection', () => {
  it('starts with the default checklist', async () => {
    const items = (await viewer.get('/api/inspection-items').expect(200)).body.items.map((i: { title: string }) => i.title);
    expect(items).toEqual([
      'Cell format and count', 'Interconnects and welds', 'Cell compression and fixing', 'Protection board and its rating',
      'Wire gauge and terminations', 'Temperature sensors and their placement', 'Heater and its control', 'Adhesive or potting',
      'Case and sealing', 'Balance leads',
    ]);
  });

  it('lets an admin edit the checklist and nobody else', async () => {
    await tech.post('/api/inspection-items').send({ title: 'Vent path' }).expect(403);
    const added = (await admin.post('/api/inspection-items').send({ title: 'Vent path' }).expect(201)).body.item;
    expect(added).toMatchObject({ title: 'Vent path', position: 11, archived: false });
    await tech.patch(`/api/inspection-items/${added.id}`).send({ title: 'Vents' }).expect(403);
    expect((await admin.patch(`/api/inspection-items/${added.id}`).send({ title: 'Vents and pressure relief' }).expect(200)).body.item.title).toBe('Vents and pressure relief');
    await admin.post('/api/inspection-items').send({ title: '' }).expect(400);
  });

  it('rates items for a pack; a viewer reads but cannot rate; a retired item takes no new rating', async () => {
    const battery = (await tech.post('/api/batteries').send({ ...pack, label: 'NG-0191' }).expect(201)).body.battery;
    const items = (await viewer.get('/api/inspection-items').expect(200)).body.items as { id: number; title: string }[];
    const welds = items.find((i) => i.title === 'Interconnects and welds')!;
    await viewer.put(`/api/batteries/${battery.id}/inspection/${welds.id}`).send({ rating: 'good', note: null }).expect(403);
    await tech.put(`/api/batteries/${battery.id}/inspection/${welds.id}`).send({ rating: 'splendid' }).expect(400);
    await tech.put(`/api/batteries/${battery.id}/inspection/${welds.id}`).send({ rating: 'acceptable', note: 'one weld off-centre' }).expect(200);
    const entry = (await tech.put(`/api/batteries/${battery.id}/inspection/${welds.id}`).send({ rating: 'concern', note: 'two welds cracked' }).expect(200)).body.entry;
    expect(entry).toMatchObject({ rating: 'concern', note: 'two welds cracked' });

    const heater = items.find((i) => i.title === 'Heater and its control')!;
    await admin.patch(`/api/inspection-items/${heater.id}`).send({ archived: true }).expect(200);
    await tech.put(`/api/batteries/${battery.id}/inspection/${heater.id}`).send({ rating: 'good' }).expect(409);

    const inspection = InspectionResponseSchema.parse((await viewer.get(`/api/batteries/${battery.id}/inspection`).expect(200)).body);
    const titles = inspection.entries.map((e) => e.item.title);
    expect(titles).not.toContain('Heater and its control');
    expect(inspection.entries.find((e) => e.item.id === welds.id)).toMatchObject({ rating: 'concern', note: 'two welds cracked' });
    await admin.patch(`/api/inspection-items/${heater.id}`).send({ archived: false }).expect(200);
  });
});
