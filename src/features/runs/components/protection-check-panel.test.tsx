import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { ProtectionResult } from '../../../../shared/schemas/protection-check';
import type { Run } from '../../../../shared/schemas/run';
import { RunSummarySchema, type RunSummary } from '../../../../shared/schemas/run-summary';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
// Issue 11 item 7's figures: a protection check that showed "Charged in 178.9 Wh, 6.78 Ah" live,
// a chamber that peaked at 80.2 °C while the cell peaked at 72.0 °C.
const summary: RunSummary = RunSummarySchema.parse({
  durationSeconds: 3600, readings: 3600, rejectedReadings: 0, gaps: 0, gapSeconds: 0, meanVolts: null, meanAmps: null, meanWatts: null,
  minVolts: 12.9, maxVolts: 14.1, minTempCelsius: -4, maxTempCelsius: 80.2, chemistry: 'lfp', cellsInSeries: 4, nominalVolts: 12.8,
  ratedAh: 50, ratedWh: 640, percentRatedAh: null, percentRatedWh: null, acceptancePercent: 95, verdict: 'not-applicable',
  cutoffCause: null, cutoffVolts: null, recoverySeconds: null, cRate: null, costPerKWh: null, whPerKg: null, roundTripEfficiency: null,
  internalResistanceOhms: null, correctedAh25C: null, dischargeWh: 0, dischargeAh: 0, chargeWh: 178.9, chargeAh: 6.78,
  tempChannels: { cell: { minCelsius: -4, maxCelsius: 72 }, chamber: { minCelsius: -10, maxCelsius: 80.2 } },
  protections: [],
});
const row = (over: Partial<ProtectionResult>): ProtectionResult => ({
  protection: 'cold-charge', unit: '°C', channel: 'cell', expectedValue: 0, expectedDelaySeconds: 5, expectedReleaseValue: 3,
  thresholdTolerance: 2, delayToleranceSeconds: 1.5, measuredValue: -0.1, measuredDelaySeconds: 5, releaseValue: 3, resumeSeconds: 545,
  beyondAtStart: false, meanHeaterAmps: null, peakHeaterAmps: null, trips: 1, outcome: 'pass', notes: [], window: { fromSeconds: 170, toSeconds: 780 }, ...over,
});
summary.protections = [
  row({}),
  row({ protection: 'over-temp-charge', expectedValue: 60, expectedDelaySeconds: 10, measuredValue: 64.5, measuredDelaySeconds: 30, releaseValue: null, resumeSeconds: null, outcome: 'fail', notes: ['Took 30.0 s, outside 10 ± 2.0 s.'], window: { fromSeconds: 2000, toSeconds: 2100 } }),
];
const run: Run = {
  id: 4, name: 'Cold-charge and hot-charge check', tags: [], origin: 'live', benchId: 2, batteryId: 3, kind: 'protection-check', state: 'finished',
  endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'manual', targetAh: null, targetWh: null, afterRecoverySeconds: 0,
  readingsCount: 3600, summary, startedAt: now, endedAt: now, createdBy: 1, createdAt: now, updatedAt: now,
};
const readings = { runId: 4, from: 0, to: 2, reduced: false, bucketSeconds: null, readingsInWindow: 3, x: [0, 1, 2], volts: { min: [13, 13, 13], max: [13, 13, 13] }, amps: { min: [-5, -5, -5], max: [-5, -5, -5] }, watts: { min: [-65, -65, -65], max: [-65, -65, -65] }, temps: {} };

describe('a protection-check run page', () => {
  it('shows the per-protection table instead of a capacity verdict, the charge put in, each channel by name, and links to each stretch', async () => {
    const { calls } = stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/runs/4') return { status: 200, body: { run } };
      if (url.startsWith('/api/runs/4/events')) return { status: 200, body: { events: [] } };
      if (url.startsWith('/api/runs/4/readings')) return { status: 200, body: readings };
      return undefined;
    });
    const { router } = renderAt('/runs/4');
    const table = await screen.findByRole('table', { name: 'Protections checked' });
    const rows = within(table).getAllByRole('row');
    expect(rows[1]!.textContent).toMatch(/Cold-charge inhibit.*0\.0 °C.*-0\.1 °C.*± 2\.0 °C.*3\.0 °C.*Pass/);
    expect(rows[2]!.textContent).toMatch(/Over-temperature, charging.*Fail.*outside 10 ± 2\.0 s/);
    expect(screen.queryByText(/of rated Ah/)).toBeNull();
    expect(screen.getByText(/no capacity verdict/i)).toBeTruthy();
    expect(screen.getByText(/178\.9 Wh/)).toBeTruthy();
    expect(screen.getByText(/6\.78 Ah/)).toBeTruthy();
    expect(screen.getByText(/cell -4\.0 °C to 72\.0 °C/)).toBeTruthy();
    expect(screen.getByText(/chamber -10\.0 °C to 80\.2 °C/)).toBeTruthy();
    await userEvent.click(within(rows[2]!).getByRole('link', { name: 'Show on chart' }));
    await waitFor(() => expect(router.state.location.search).toBe('?from=2000&to=2100'));
    await waitFor(() => expect(calls.some((c) => c.url.startsWith('/api/runs/4/readings') && c.url.includes('from=2000') && c.url.includes('to=2100'))).toBe(true));
  });

  it('stands in for the verdict in the runs list: how many protections passed and failed, no capacity figure', async () => {
    stubApi(demoUser('viewer'), (url) => (url.startsWith('/api/runs?') ? { status: 200, body: { runs: [run], total: 1 } } : undefined));
    renderAt('/runs');
    expect(await screen.findByText('Protections: 1 pass, 1 fail')).toBeTruthy();
    expect(screen.queryByText('No capacity verdict')).toBeNull();
  });

  it('a charge run\'s page shows the energy and charge put in, as the live view did', async () => {
    const charge: Run = { ...run, id: 6, kind: 'charge', summary: { ...summary, verdict: 'unrated', protections: undefined } };
    stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/runs/6') return { status: 200, body: { run: charge } };
      if (url.startsWith('/api/runs/6/events')) return { status: 200, body: { events: [] } };
      if (url.startsWith('/api/runs/6/readings')) return { status: 200, body: { ...readings, runId: 6 } };
      return undefined;
    });
    renderAt('/runs/6');
    expect(await screen.findByText('In, whole run')).toBeTruthy();
    expect(screen.getByText('178.9 Wh')).toBeTruthy();
    expect(screen.getByText('6.78 Ah')).toBeTruthy();
    expect(screen.getByText(/chamber -10\.0 °C to 80\.2 °C/)).toBeTruthy();
  });
});
