import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
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
const samples = (id: number) => ({
  runId: id, from: 0, to: 2, reduced: false, bucketSeconds: null, readingsInWindow: 3, t: [0, 1, 2],
  volts: { min: [13.2, 13.1, 12.9], max: [13.2, 13.1, 12.9] }, amps: { min: [5, 5, 5], max: [5, 5, 5] },
  watts: { min: [66, 65, 64], max: [66, 65, 64] }, temps: {},
});

function api(url: string) {
  if (url.startsWith('/api/runs?')) return { status: 200, body: { runs, total: runs.length } };
  const one = url.match(/^\/api\/runs\/(\d+)$/);
  if (one) return { status: 200, body: { run: runs.find((r) => r.id === Number(one[1])) } };
  const s = url.match(/^\/api\/runs\/(\d+)\/samples/);
  if (s) return { status: 200, body: samples(Number(s[1])) };
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
