import { xyIntegration } from 'ml-spectra-processing';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, seedDemoLabHistory } from '../../server/db/seed-demo.js';
import { DEMO_HISTORY, demoHistoryCsv } from '../../server/runs/seed-demo-history.js';
import { createTestContext, signInAs, type TestContext } from './helpers/index.js';

/** A seeding pass simulates about 16,000 readings and imports them: slow on a busy machine. */
const SEED_TIMEOUT_MS = 180_000;

interface ApiRun {
  id: number;
  name: string;
  batteryId: number | null;
  state: string;
  startedAt: string | null;
  summary: { capacityAh: number | null; percentRatedAh: number | null; verdict: string; capacityEndedBy: string | null; dischargeAh: number } | null;
}

let t: TestContext;
let ids: number[] = [];

beforeAll(async () => {
  t = await createTestContext({ demo: true, users: false });
  ids = await seedDemoLabHistory(t.ctx);
}, SEED_TIMEOUT_MS);

afterAll(async () => {
  await t?.close();
});

/** The discharge current integrated over the log the seeding wrote (trapezoid rule), Ah. */
function referenceDischargeAh(csv: string): number {
  const rows = csv.trim().split('\n').slice(1).map((line) => line.split(','));
  const x = rows.map((r) => Date.parse(r[0]!) / 3_600_000);
  // Discharge only: positive amps (the rest after the cutoff reads noise about 0 A).
  const y = rows.map((r) => Math.max(0, Number(r[2])));
  // ml-spectra-processing xyIntegration (npm): the plain trapezoidal rule, an independent implementation.
  return xyIntegration({ x, y });
}

describe('the demo lab starts with its past runs', () => {
  it('imports every past run through the importer, on its pack, at its date, with its note', async () => {
    expect(ids).toHaveLength(DEMO_HISTORY.length);
    const viewer = await signInAs(t, 'viewer', { email: DEMO_ACCOUNTS[2]!.email, password: t.ctx.config.demoPassword });
    const batteries = (await viewer.get('/api/batteries').expect(200)).body.batteries as { id: number; label: string }[];
    for (const [i, spec] of DEMO_HISTORY.entries()) {
      const run = (await viewer.get(`/api/runs/${ids[i]}`).expect(200)).body.run as ApiRun;
      expect(run.name).toBe(spec.name);
      expect(run.state).toBe('finished');
      expect(run.batteryId).toBe(batteries.find((b) => b.label === spec.batteryLabel)!.id);
      expect(new Date(run.startedAt!).toISOString()).toBe(new Date(spec.startedAtIso).toISOString());
      const events = (await viewer.get(`/api/runs/${ids[i]}/events`).expect(200)).body.events as { event: { type: string; text?: string } }[];
      expect(events.filter((e) => e.event.type === 'annotation').map((e) => e.event.text)).toEqual([spec.note.text]);
    }
  });

  it('gives figures a lab can check: whole-run Ah equal the trapezoid of the log, and the verdicts the packs were built for', async () => {
    const viewer = await signInAs(t, 'viewer', { email: DEMO_ACCOUNTS[2]!.email, password: t.ctx.config.demoPassword });
    const runs: ApiRun[] = [];
    for (const [i, spec] of DEMO_HISTORY.entries()) {
      const run = (await viewer.get(`/api/runs/${ids[i]}`).expect(200)).body.run as ApiRun;
      runs.push(run);
      // The log carries 3 decimals of amps: the importer's integral matches the reference to 1e-6 relative.
      expect(run.summary!.dischargeAh).toBeCloseTo(referenceDischargeAh(demoHistoryCsv(spec)), 3);
    }
    const [june, november, wren, hollis] = runs;
    // Two tests of one pack: the pack's record shows the capacity falling between them.
    expect(june!.summary!.percentRatedAh!).toBeGreaterThan(november!.summary!.percentRatedAh!);
    expect(june!.summary!.verdict).toBe('pass');
    // A pack with one cell group at 84 %: its protection ends the test well short of the lab's 95 %.
    expect(wren!.summary!.capacityEndedBy).toBe('protection');
    expect(wren!.summary!.verdict).toBe('fail');
    expect(wren!.summary!.percentRatedAh!).toBeLessThan(90);
    // The lead-acid battery at its 20-hour rate stops at its end voltage of 10.5 V.
    expect(hollis!.summary!.capacityEndedBy).toBe('end-voltage');
    expect(hollis!.summary!.verdict).toBe('pass');
  });
});
