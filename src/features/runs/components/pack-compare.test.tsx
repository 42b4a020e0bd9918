import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
import { RunSummarySchema } from '../../../../shared/schemas/run-summary';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';
import { formatPackChoices, parsePackChoices, representativeRun } from './pack-compare';

const now = '2026-12-01T20:00:00Z';
const summary = (capacityAh: number) => RunSummarySchema.parse({
  durationSeconds: 36_000, readings: 36_000, rejectedReadings: 0, gaps: 0, gapSeconds: 0, meanVolts: 12.8, meanAmps: 5, meanWatts: 64,
  minVolts: 10, maxVolts: 13.4, minTempCelsius: 20, maxTempCelsius: 25, chemistry: 'lfp', cellsInSeries: 4, nominalVolts: 12.8,
  ratedAh: 50, ratedWh: 640, percentRatedAh: (capacityAh / 50) * 100, percentRatedWh: null, acceptancePercent: 95, verdict: 'pass',
  cutoffCause: null, cutoffVolts: 10, recoverySeconds: 5, cRate: 0.1, costPerKWh: null, whPerKg: null, roundTripEfficiency: null,
  internalResistanceOhms: null, correctedAh25C: null, dischargeWh: capacityAh * 12.8, dischargeAh: capacityAh, chargeWh: 0, chargeAh: 0,
  capacityAh, capacityWh: capacityAh * 12.8, tempChannels: {}, protections: [],
});
function run(id: number, name: string, batteryId: number, kind: Run['kind'], capacityAh: number | null): Run {
  return {
    id, name, tags: [], origin: 'live', benchId: null, batteryId, kind, state: 'finished',
    endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'manual', targetAh: null, targetWh: null,
    afterRecoverySeconds: 0, readingsCount: 3, summary: capacityAh === null ? null : summary(capacityAh), startedAt: now, endedAt: now, createdBy: 1, createdAt: now, updatedAt: now,
  };
}
// Newest first, as GET /api/runs answers (demo packs of our own).
const runsOf: Record<number, Run[]> = {
  4: [run(21, 'Kestrel charge', 4, 'charge', null), run(20, 'Kestrel capacity March', 4, 'capacity-discharge', 49), run(11, 'Kestrel capacity January', 4, 'capacity-discharge', 50.5)],
  7: [run(30, 'Larkspur capacity', 7, 'capacity-discharge', 47)],
  9: [],
};
const pack = (id: number, label: string) => ({ id, label });

describe('packs selection in the address', () => {
  it('reads and writes packs=4,7:12, dropping bad and repeated entries', () => {
    expect(parsePackChoices('4,7:12,x,4:3,')).toEqual([{ batteryId: 4, runId: null }, { batteryId: 7, runId: 12 }]);
    expect(formatPackChoices([{ batteryId: 4, runId: null }, { batteryId: 7, runId: 12 }])).toBe('4,7:12');
  });

  it('stands a pack for its latest finished capacity run, or the chosen one', () => {
    expect(representativeRun(runsOf[4]!, null)?.id).toBe(20);
    expect(representativeRun(runsOf[4]!, 11)?.id).toBe(11);
    expect(representativeRun(runsOf[4]!, 21)?.id).toBe(20); // a charge run cannot stand for a capacity
    expect(representativeRun(runsOf[9]!, null)).toBeNull();
  });
});

describe('comparing packs', () => {
  it('overlays each ticked pack by its capacity run and keeps the choice in the URL', async () => {
    stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack(4, 'Kestrel 12 V'), pack(7, 'Larkspur 12 V'), pack(9, 'Wren 24 V')].map((b) => ({ ...batteryBase, ...b })) } };
      const list = url.match(/^\/api\/runs\?.*batteryId=(\d+)/);
      if (list) return { status: 200, body: { runs: runsOf[Number(list[1])] ?? [], total: 0 } };
      const one = url.match(/^\/api\/runs\/(\d+)$/);
      if (one) return { status: 200, body: { run: Object.values(runsOf).flat().find((r) => r.id === Number(one[1])) } };
      if (/^\/api\/runs\/\d+\/readings/.test(url)) {
        return { status: 200, body: { runId: 0, axis: 'ah', from: 0, to: 2, reduced: false, bucketSeconds: null, readingsInWindow: 2, x: [0, 2], volts: { min: [13, 12], max: [13, 12] }, amps: { min: [5, 5], max: [5, 5] }, watts: { min: [65, 60], max: [65, 60] }, temps: {} } };
      }
      return undefined;
    });
    const { router } = renderAt('/runs/compare?packs=4');
    await screen.findByTestId('compare-chart');
    expect(within(screen.getByRole('table')).getByText('Kestrel capacity March')).toBeTruthy();
    await userEvent.click(screen.getByRole('checkbox', { name: 'Larkspur 12 V' }));
    await waitFor(() => expect(router.state.location.search).toBe('?packs=4%2C7'));
    expect(await within(screen.getByRole('table')).findByText('Larkspur capacity')).toBeTruthy();
    await userEvent.selectOptions(screen.getByRole('combobox', { name: /Kestrel 12 V by run/ }), '11');
    await waitFor(() => expect(router.state.location.search).toBe('?packs=4%3A11%2C7'));
    expect(await within(screen.getByRole('table')).findByText('Kestrel capacity January')).toBeTruthy();
    await userEvent.click(screen.getByRole('checkbox', { name: 'Wren 24 V' }));
    expect(await screen.findByText('Wren 24 V: no finished capacity run yet.')).toBeTruthy();
  });
});

const batteryBase = {
  brand: 'Northgate', model: null, chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 50, ratedWh: 640, bmsRatedAmps: 50, massKg: 6.2, price: null,
  priceCurrency: null, serialNumber: null, sender: null, notes: '', receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null, terminalType: null,
  statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: now, updatedAt: now,
};
