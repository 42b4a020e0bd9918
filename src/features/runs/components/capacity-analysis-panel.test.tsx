import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import uPlot from 'uplot';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
import { RunSummarySchema } from '../../../../shared/schemas/run-summary';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';
import { dischargePoints } from './capacity-analysis';

const now = '2026-12-01T20:00:00Z';
// Demo data of our own: a 4-cell LFP pack rated 50 Ah that gave 48 Ah at a mean 10 A (0.2 C).
const summary = RunSummarySchema.parse({
  durationSeconds: 17_280, readings: 17_280, rejectedReadings: 0, gaps: 0, gapSeconds: 0, meanVolts: 13, meanAmps: 10, meanWatts: 130,
  minVolts: 10, maxVolts: 13.4, minTempCelsius: 21, maxTempCelsius: 24, chemistry: 'lfp', cellsInSeries: 4, nominalVolts: 12.8,
  ratedAh: 50, ratedWh: 640, capacityAh: 48, capacityWh: 620, percentRatedAh: 96, percentRatedWh: 96.9, acceptancePercent: 95, verdict: 'pass',
  cutoffCause: 'end-voltage', cutoffVolts: 10, recoverySeconds: 20, cRate: 0.2, costPerKWh: null, whPerKg: null, roundTripEfficiency: null,
  internalResistanceOhms: null, correctedAh25C: null, dischargeWh: 620, dischargeAh: 48, chargeWh: 0, chargeAh: 0, tempChannels: {}, protections: [],
});
const run: Run = {
  id: 9, name: 'Capacity, Northgate test pack 4S', tags: [], origin: 'live', benchId: 2, batteryId: null, kind: 'capacity-discharge', state: 'finished',
  endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'after-recovery', targetAh: null, targetWh: null, afterRecoverySeconds: 0,
  readingsCount: 17_280, summary, startedAt: now, endedAt: now, createdBy: 1, createdAt: now, updatedAt: now,
};
// Volts against delivered Ah: a steady slope with a flat stretch (a plateau) at 20 Ah, then the knee; past 48 Ah the pack recovers.
const ah = Array.from({ length: 2_000 }, (_, i) => (i * 50) / 2_000);
const voltsAt = (q: number) => (q > 48 ? 12.6 : 13.4 - 0.05 * q + 0.09 * Math.tanh((q - 20) / 2) - 1.5 * Math.exp((q - 48) / 1.5));
const curve = ah.map(voltsAt);
const readings = { runId: 9, axis: 'ah' as const, from: 0, to: 50, reduced: true, bucketSeconds: 0.025, readingsInWindow: 17_280, x: ah, volts: { min: curve, max: curve }, amps: { min: ah.map(() => 10), max: ah.map(() => 10) }, watts: { min: curve.map((v) => v * 10), max: curve.map((v) => v * 10) }, temps: {} };

type Plot = { data: number[][]; opts: unknown };
const plots = () => (uPlot as unknown as { instances: Plot[] }).instances;

describe('a capacity run page: incremental capacity and run time at other currents', () => {
  it('draws dQ/dV of the discharge to the end voltage and estimates run time by Peukert, naming the method and its limits', async () => {
    const { calls } = stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/runs/9') return { status: 200, body: { run } };
      if (url.startsWith('/api/runs/9/events')) return { status: 200, body: { events: [] } };
      if (url.startsWith('/api/runs/9/readings')) return { status: 200, body: url.includes('x=ah') ? readings : { ...readings, axis: 'elapsedSeconds' } };
      return undefined;
    });
    renderAt('/runs/9');
    await screen.findByTestId('ic-chart');
    expect(calls.some((c) => c.url.startsWith('/api/runs/9/readings') && c.url.includes('x=ah'))).toBe(true);
    await waitFor(() => expect(plots().some((p) => JSON.stringify(p.opts).includes('dQ/dV'))).toBe(true));
    const ic = plots().findLast((p) => JSON.stringify(p.opts).includes('dQ/dV'))!;
    const [volts, dQdV] = ic.data;
    // Volts ascending for uPlot; nothing past the end voltage's Ah (the recovery at 12.6 V) enters the curve.
    expect(volts!.length).toBeGreaterThan(20);
    expect([...volts!].sort((a, b) => a - b)).toEqual(volts);
    expect(dQdV!.every((x) => x > 0)).toBe(true);
    // The plateau is where the most Ah come per volt: dV/dQ = −0.05 + 0.045·sech²((Q − 20)/2) is flattest at 20 Ah.
    const peakVolts = volts![dQdV!.indexOf(Math.max(...dQdV!))]!;
    expect(Math.abs(peakVolts - voltsAt(20))).toBeLessThan(0.1);
    expect(dischargePoints(readings, 48).every((p) => p.dischargeAh <= 48)).toBe(true);

    const section = screen.getByRole('region', { name: 'Capacity analysis' });
    expect(within(section).getByText(/Peukert, 1897/)).toBeTruthy();
    expect(within(section).getByText(/Lithium cells have k close to 1/)).toBeTruthy();
    const rows = within(screen.getByTestId('peukert-table')).getAllByRole('row').slice(1).map((r) => r.textContent);
    // At the test's own current the estimate is the test itself: 48 Ah at 10 A = 4 h 48 min.
    expect(rows).toContain('10.00 A0.2 C4 h 48 min');
    // LFP's typical k = 1.05: at 50 A, 4.8 h × (10/50)^1.05 = 0.886 h = 53 min 09 s (arithmetic).
    expect(rows).toContain('50.00 A1 C53 min 09 s');
    // k = 1 is an ideal battery: the same 48 Ah at 50 A last 0.96 h = 57 min 36 s.
    fireEvent.change(screen.getByLabelText('Peukert exponent k'), { target: { value: '1' } });
    await waitFor(() => expect(within(screen.getByTestId('peukert-table')).getAllByRole('row').map((r) => r.textContent)).toContain('50.00 A1 C57 min 36 s'));
    fireEvent.change(screen.getByLabelText('Peukert exponent k'), { target: { value: '7' } });
    expect(await screen.findByText(/k must be between 1 and 2/)).toBeTruthy();
  });
});
