import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ImportResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

/**
 * An export imports back: the file Kneepoint writes now (run time column `elapsedSeconds`) and
 * a file written before the rename (the same column called `elapsed`) give the same Wh and Ah.
 */
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext();
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
});
afterAll(() => t?.close());

// A linear voltage ramp at constant current, logged every second: the trapezoidal rule is exact
// for a linear integrand, so Ah = I·T/3600 and Wh = I·(V0·T − b·T²/2)/3600 (any calculus text).
const AMPS = 5;
const V0 = 13.2;
const SLOPE_V_PER_S = 0.001;
const SECONDS = 3000;
/** The logger's clock at the start: source time `t` and run time differ by this in every export. */
const LOGGER_START_SECONDS = 1000;
const ROUND_TRIP_TOLERANCE = 1e-9;

const importCsv = async (name: string, csv: string) =>
  ImportResponseSchema.parse((await tech.post('/api/runs/import').field('name', name).attach('file', Buffer.from(csv), `${name}.csv`).expect(201)).body);

const exportCsv = async (runId: number) => (await viewer.get(`/api/runs/${runId}/export.csv`).expect(200)).text;

/** The first data row of an export, as [run time, source time]. */
const firstTimes = (csv: string) => csv.split('\n').filter((l) => /^-?\d/.test(l))[0]!.split(',').slice(0, 2).map(Number);

describe('export, then import the export', () => {
  let original: Awaited<ReturnType<typeof importCsv>>;
  let exported: string;

  beforeAll(async () => {
    const rows = Array.from({ length: SECONDS + 1 }, (_, s) => `${LOGGER_START_SECONDS + s},${(V0 - SLOPE_V_PER_S * s).toFixed(3)},${AMPS}`);
    original = await importCsv('ramp', `time_s,voltage_v,current_a\n${rows.join('\n')}\n`);
    exported = await exportCsv(original.run.id);
  });

  it('measures the ramp to its closed form', () => {
    expect(original.summary.dischargeAh).toBeCloseTo((AMPS * SECONDS) / 3600, 9);
    expect(original.summary.energyWh).toBeCloseTo((AMPS * (V0 * SECONDS - (SLOPE_V_PER_S * SECONDS * SECONDS) / 2)) / 3600, 9);
  });

  it('names the run time column elapsedSeconds in the CSV header and the JSON columns', async () => {
    const header = exported.split('\n').find((l) => !l.startsWith('#'))!.split(',');
    expect(header.slice(0, 2)).toEqual(['elapsedSeconds', 't']);
    expect(firstTimes(exported)).toEqual([0, LOGGER_START_SECONDS]);
    expect(header).not.toContain('elapsed'); // vocab-rename: keep
    const json = JSON.parse((await viewer.get(`/api/runs/${original.run.id}/export.json`).expect(200)).text) as { columns: string[]; meta: { units: Record<string, string> } };
    expect(json.columns).toEqual(header);
    expect(json.meta.units.elapsedSeconds).toBe('s since run start');
  });

  it('imports a current export back to the same Wh and Ah', async () => {
    const back = await importCsv('ramp again', exported);
    // The time read back is the run time column, not the source time beside it.
    expect(firstTimes(await exportCsv(back.run.id))).toEqual([0, 0]);
    expect(back.summary.rows).toBe(SECONDS + 1);
    expect(back.summary.durationSeconds).toBe(original.summary.durationSeconds);
    expect(Math.abs(back.summary.dischargeAh - original.summary.dischargeAh)).toBeLessThan(ROUND_TRIP_TOLERANCE);
    expect(Math.abs(back.summary.energyWh - original.summary.energyWh)).toBeLessThan(ROUND_TRIP_TOLERANCE);
  });

  it('imports an export written before the rename (column `elapsed`) to the same Wh and Ah', async () => {
    const lines = exported.split('\n');
    const at = lines.findIndex((l) => !l.startsWith('#'));
    lines[at] = lines[at]!.replace(/^elapsedSeconds,/, 'elapsed,'); // vocab-rename: keep
    const old = lines.join('\n');
    expect(old).not.toMatch(/^elapsedSeconds,/m);
    const back = await importCsv('ramp from an old export', old);
    expect(firstTimes(await exportCsv(back.run.id))).toEqual([0, 0]);
    expect(back.summary.rows).toBe(SECONDS + 1);
    expect(back.summary.durationSeconds).toBe(original.summary.durationSeconds);
    expect(Math.abs(back.summary.dischargeAh - original.summary.dischargeAh)).toBeLessThan(ROUND_TRIP_TOLERANCE);
    expect(Math.abs(back.summary.energyWh - original.summary.energyWh)).toBeLessThan(ROUND_TRIP_TOLERANCE);
  });
});
