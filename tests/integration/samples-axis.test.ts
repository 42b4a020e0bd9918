import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ReadingsResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';

let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let runId: number;

const AMPS = 2;
const STEP_S = 10;
const STEPS = 360; // one hour

beforeAll(async () => {
  t = await createTestContext();
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  // A constant-current discharge at 2 A for an hour, volts falling linearly (demo data of our own).
  const lines = ['time_s,voltage_v,current_a'];
  for (let i = 0; i <= STEPS; i++) lines.push(`${i * STEP_S},${(13.2 - i * 0.002).toFixed(3)},${AMPS}`);
  const battery = (await tech.post('/api/batteries').send({ label: 'NG-AX1', brand: 'Northgate', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 2 }).expect(201)).body.battery;
  const res = await tech
    .post('/api/runs/import')
    .field('name', 'constant current hour')
    .field('batteryId', String(battery.id))
    .field('currentSign', 'discharge-positive')
    .attach('file', Buffer.from(lines.join('\n') + '\n'), 'cc.csv');
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  runId = res.body.run.id;
});
afterAll(async () => {
  await t?.close();
});

describe('GET /api/runs/:id/readings?x=ah', () => {
  it('places each reading at its delivered Ah: analytic check Ah(t) = I·t/3600 at constant current', async () => {
    const body = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/readings?x=ah&maxPoints=1000`).expect(200)).body);
    expect(body.axis).toBe('ah');
    expect(body.reduced).toBe(false);
    expect(body.x).toHaveLength(STEPS + 1);
    // Analytic: Q = I·t for a constant current; the trapezoid rule is exact for a constant.
    for (const i of [0, 1, 180, 360]) expect(body.x[i]).toBeCloseTo((AMPS * i * STEP_S) / SECONDS_PER_HOUR, 12);
    expect(body.from).toBe(0);
    expect(body.to).toBeCloseTo(2, 12);
    expect(body.volts.min[180]).toBeCloseTo(13.2 - 180 * 0.002, 9);
  });

  it('buckets over Ah and Wh with equal widths up to the delivered total', async () => {
    const ah = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/readings?x=ah&maxPoints=20`).expect(200)).body);
    expect(ah.reduced).toBe(true);
    expect(ah.x).toHaveLength(20);
    expect(ah.bucketSeconds).toBeCloseTo(2 / 20, 12);
    expect(ah.volts.max[0]).toBe(13.2);
    const wh = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/readings?x=wh&maxPoints=20`).expect(200)).body);
    // Analytic: E = I·∫(V0 − k·t) dt = I·(V0·T − k·T²/2) with k = 0.002 V per 10 s.
    const T = STEPS * STEP_S;
    expect(wh.to).toBeCloseTo((AMPS * (13.2 * T - (0.0002 * T * T) / 2)) / SECONDS_PER_HOUR, 6);
  });

  it('takes a window in Ah and refuses an unknown axis or a reversed window', async () => {
    const part = ReadingsResponseSchema.parse((await viewer.get(`/api/runs/${runId}/readings?x=ah&from=0.5&to=1`).expect(200)).body);
    expect(part.x[0]).toBeGreaterThanOrEqual(0.5);
    expect(part.x.at(-1)).toBeLessThanOrEqual(1);
    expect(part.x).toHaveLength(91); // readings at 900 s … 1800 s
    await viewer.get(`/api/runs/${runId}/readings?x=kwh`).expect(400);
    await viewer.get(`/api/runs/${runId}/readings?x=ah&from=1&to=0.5`).expect(400);
    await viewer.get(`/api/runs/${runId}/readings?x=ah&from=5`).expect(400); // beyond the 2 Ah delivered
  });
});
