import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
import { RunSummarySchema, type RunSummary } from '../../../../shared/schemas/run-summary';
import { ratingMarkers, toPercentOfRated } from './run-compare';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
function run(id: number, name: string): Run {
  return {
    id, name, tags: [], origin: 'live', benchId: null, batteryId: null, kind: 'capacity-discharge', state: 'finished',
    endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'manual', targetAh: null, targetWh: null,
    afterRecoverySeconds: 0, readingsCount: 3, summary: null, startedAt: now, endedAt: now, createdBy: 1, createdAt: now, updatedAt: now,
  };
}
const runs = [run(3, 'Voltara pack A'), run(5, 'Voltara pack B'), run(8, 'Hollis pack')];
/** A finished capacity run's summary with the figures the compare table shows (demo data of our own). */
function summaryOf(over: { capacityWh: number | null; capacityAh: number | null; ratedAh: number; ratedWh: number | null; meanVolts: number; recoverySeconds: number | null; costPerKWh: number | null; whPerKg: number | null }): RunSummary {
  const percent = over.capacityAh === null ? null : (over.capacityAh / over.ratedAh) * 100;
  return RunSummarySchema.parse({
    durationSeconds: 36_000, readings: 36_000, rejectedReadings: 0, gaps: 0, gapSeconds: 0, meanAmps: 5, meanWatts: 64,
    minVolts: 10, maxVolts: 13.4, minTempCelsius: 20, maxTempCelsius: 25, chemistry: 'lfp', cellsInSeries: 4, nominalVolts: 12.8,
    percentRatedAh: percent, percentRatedWh: null, acceptancePercent: 95, verdict: percent !== null && percent >= 95 ? 'pass' : 'fail',
    cutoffCause: null, cutoffVolts: 10, cRate: 0.1, roundTripEfficiency: null,
    internalResistanceOhms: null, correctedAh25C: null, dischargeWh: over.capacityWh ?? 0, dischargeAh: over.capacityAh ?? 0, chargeWh: 0, chargeAh: 0,
    tempChannels: {}, protections: [], ...over,
  });
}
const sumA = summaryOf({ capacityWh: 610, capacityAh: 48, ratedAh: 50, ratedWh: 640, meanVolts: 12.7, recoverySeconds: 12, costPerKWh: 410, whPerKg: 98 });
const sumB = summaryOf({ capacityWh: 655, capacityAh: 51, ratedAh: 50, ratedWh: 640, meanVolts: 12.85, recoverySeconds: 4, costPerKWh: 380, whPerKg: 104 });
const sumH = summaryOf({ capacityWh: 300, capacityAh: 24, ratedAh: 25, ratedWh: 320, meanVolts: 12.5, recoverySeconds: null, costPerKWh: null, whPerKg: 91 });
const measured = [{ ...run(3, 'Voltara pack A'), summary: sumA }, { ...run(5, 'Voltara pack B'), summary: sumB }, { ...run(8, 'Hollis pack'), summary: sumH }];
const requested: string[] = [];
function measuredApi(url: string) {
  requested.push(url);
  const one = url.match(/^\/api\/runs\/(\d+)$/);
  if (one) return { status: 200, body: { run: measured.find((r) => r.id === Number(one[1])) } };
  const s = url.match(/^\/api\/runs\/(\d+)\/readings/);
  if (s) return { status: 200, body: readings(Number(s[1])) };
  return undefined;
}
const namesInOrder = () => screen.getAllByTestId('compare-row').map((tr) => within(tr).getByRole('link').textContent);

const readings = (id: number) => ({
  runId: id, axis: 'elapsedSeconds', from: 0, to: 2, reduced: false, bucketSeconds: null, readingsInWindow: 3, x: [0, 1, 2],
  volts: { min: [13.2, 13.1, 12.9], max: [13.2, 13.1, 12.9] }, amps: { min: [5, 5, 5], max: [5, 5, 5] },
  watts: { min: [66, 65, 64], max: [66, 65, 64] }, temps: {},
});

function api(url: string) {
  if (url.startsWith('/api/runs?')) return { status: 200, body: { runs, total: runs.length } };
  const one = url.match(/^\/api\/runs\/(\d+)$/);
  if (one) return { status: 200, body: { run: runs.find((r) => r.id === Number(one[1])) } };
  const s = url.match(/^\/api\/runs\/(\d+)\/readings/);
  if (s) return { status: 200, body: readings(Number(s[1])) };
  return undefined;
}

describe('comparing runs', () => {
  it('offers a compare link once two runs are ticked, and the page lays both over each other', async () => {
    stubApi(demoUser('viewer'), api);
    const { router } = renderAt('/runs');
    await userEvent.click(await screen.findByRole('checkbox', { name: 'Compare Voltara pack A' }));
    expect(screen.queryByRole('link', { name: /Compare \d runs/ })).toBeNull();
    await userEvent.click(screen.getByRole('checkbox', { name: 'Compare Hollis pack' }));
    await userEvent.click(screen.getByRole('link', { name: 'Compare 2 runs' }));
    // The compare page is its own chunk: the navigation completes once it has loaded.
    await waitFor(() => expect(router.state.location.search).toBe('?ids=3,8'));
    // Wait for the compare page itself: the runs list (also a table) may still be on screen.
    await screen.findByTestId('compare-chart');
    const table = screen.getByRole('table');
    expect(within(table).getByText('Voltara pack A')).toBeTruthy();
    expect(within(table).getByText('Hollis pack')).toBeTruthy();
    expect(within(table).queryByText('Voltara pack B')).toBeNull();
    expect(screen.getByTestId('compare-chart')).toBeTruthy();
  });
});

describe('compare page', () => {
  it('sorts the table by delivered Wh, then Ah and mean volts, each number with its unit', async () => {
    stubApi(demoUser('viewer'), measuredApi);
    renderAt('/runs/compare?ids=3,5,8');
    await screen.findByTestId('compare-chart');
    expect(namesInOrder()).toEqual(['Voltara pack A', 'Voltara pack B', 'Hollis pack']);
    // A figure sorts largest first on the first click, smallest first on the second.
    await userEvent.click(screen.getByRole('button', { name: /Delivered \(Wh\)/ }));
    expect(namesInOrder()).toEqual(['Voltara pack B', 'Voltara pack A', 'Hollis pack']);
    expect(screen.getByRole('columnheader', { name: /Delivered \(Wh\)/ }).getAttribute('aria-sort')).toBe('descending');
    await userEvent.click(screen.getByRole('button', { name: /Delivered \(Wh\)/ }));
    expect(namesInOrder()).toEqual(['Hollis pack', 'Voltara pack A', 'Voltara pack B']);
    expect(screen.getByRole('columnheader', { name: /Delivered \(Wh\)/ }).getAttribute('aria-sort')).toBe('ascending');
    await userEvent.click(screen.getByRole('button', { name: /Delivered \(Ah\)/ }));
    expect(namesInOrder()).toEqual(['Voltara pack B', 'Voltara pack A', 'Hollis pack']);
    await userEvent.click(screen.getByRole('button', { name: /Mean \(V\)/ }));
    expect(namesInOrder()).toEqual(['Voltara pack B', 'Voltara pack A', 'Hollis pack']);
    await userEvent.click(screen.getByRole('button', { name: /Mean \(V\)/ }));
    expect(namesInOrder()).toEqual(['Hollis pack', 'Voltara pack A', 'Voltara pack B']);
    // A run without a cost sorts last whichever way, and reads as a dash, never 0.
    await userEvent.click(screen.getByRole('button', { name: /Cost per kWh/ }));
    expect(namesInOrder().at(-1)).toBe('Hollis pack');
    const rowB = screen.getAllByTestId('compare-row').find((tr) => within(tr).queryByText('Voltara pack B'))!;
    expect(within(rowB).getByText(/380\.00 .*\/kWh/)).toBeTruthy();
    expect(within(rowB).getByText('104.0 Wh/kg')).toBeTruthy();
    expect(within(rowB).getByText(/^51(\.\d+)? Ah$/)).toBeTruthy();
  });

  it('charts against delivered Ah by default and asks the server for the axis the selector names', async () => {
    requested.length = 0;
    stubApi(demoUser('viewer'), measuredApi);
    renderAt('/runs/compare?ids=3,8');
    await screen.findByTestId('compare-chart');
    expect(requested.filter((u) => u.includes('/readings')).every((u) => u.includes('x=ah'))).toBe(true);
    expect(screen.getByTestId('rating-marker-note').textContent).toMatch(/rated 25(\.\d+)? Ah, 50(\.\d+)? Ah/);
    await userEvent.click(screen.getByRole('radio', { name: 'Wh' }));
    await waitFor(() => expect(requested.some((u) => u.includes('/api/runs/8/readings') && u.includes('x=wh'))).toBe(true));
    await userEvent.click(screen.getByRole('radio', { name: 'Run time' }));
    await waitFor(() => expect(requested.some((u) => u.includes('/api/runs/8/readings') && !u.includes('x='))).toBe(true));
    expect(screen.queryByTestId('rating-marker-note')).toBeNull();
    await userEvent.click(screen.getByRole('radio', { name: '% of rated' }));
    expect(await screen.findByText('Dashed line: 100 % of rated')).toBeTruthy();
  });

  it('places the rating markers and the % of rated positions', () => {
    expect(ratingMarkers('ah', measured)).toEqual([25, 50]);
    expect(ratingMarkers('wh', measured)).toEqual([320, 640]);
    expect(ratingMarkers('percent', measured)).toEqual([100]);
    expect(ratingMarkers('time', measured)).toEqual([]);
    expect(toPercentOfRated([0, 12.5, 25], 25)).toEqual([0, 50, 100]);
    expect(toPercentOfRated([1, 2], null)).toEqual([]);
  });
});

describe('pack filter', () => {
  it('names the pack by its label on the filter chip', async () => {
    stubApi(demoUser('viewer'), (url) => {
      if (url.startsWith('/api/runs?')) return { status: 200, body: { runs: [], total: 0 } };
      if (url === '/api/batteries/4') {
        return { status: 200, body: { battery: { id: 4, label: 'Kestrel 12 V camper', brand: 'Kestrel Energy', model: null, chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 50, ratedWh: 640, bmsRatedAmps: 50, massKg: 6.2, price: null, priceCurrency: null, serialNumber: null, sender: null, notes: '', receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null, terminalType: null, statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: now, updatedAt: now } } };
      }
      return undefined;
    });
    renderAt('/runs?batteryId=4');
    expect(await screen.findByText('Only pack Kestrel 12 V camper')).toBeTruthy();
  });
});
