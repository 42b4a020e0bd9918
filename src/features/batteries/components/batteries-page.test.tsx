import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Battery } from '../../../../shared/schemas/battery';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
// A fictional pack of the demo lab.
const pack: Battery = {
  id: 4, label: 'NG-0142', brand: 'Hollis Power', model: 'Keep 12-35', chemistry: 'lead-acid', cellsInSeries: 6, cellsInParallel: 1,
  ratedAh: 35, ratedWh: 420, bmsRatedAmps: null, massKg: 10.8, price: null, priceCurrency: null, serialNumber: 'HP-K12-1180',
  sender: null, notes: null, receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null,
  terminalType: null, statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: now, updatedAt: now,
};

describe('battery packs page', () => {
  it('shows every figure with its unit and no edit button to a viewer', async () => {
    stubApi(demoUser('viewer'), (url) => (url === '/api/batteries' ? { status: 200, body: { batteries: [pack] } } : undefined));
    renderAt('/batteries');
    expect(await screen.findByText('35.00 Ah · 420.0 Wh')).toBeTruthy();
    expect(screen.getByText('10.80 kg')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Edit NG-0142' })).toBeNull();
  });

  it("links each pack to its own run history", async () => {
    const { calls } = stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack] } };
      if (url.startsWith('/api/runs?')) return { status: 200, body: { runs: [], total: 0 } };
      return undefined;
    });
    renderAt('/batteries');
    await userEvent.click(await screen.findByRole('link', { name: 'Runs of NG-0142' }));
    expect(await screen.findByText('Only pack #4')).toBeTruthy();
    await waitFor(() => expect(calls.some((c) => c.url.startsWith('/api/runs?') && c.url.includes('batteryId=4'))).toBe(true));
  });

  it('lets a technician correct a pack and sends the change as a PATCH', async () => {
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack] } };
      if (url === '/api/batteries/4' && init?.method === 'PATCH') return { status: 200, body: { battery: { ...pack, ratedAh: 36 } } };
      return undefined;
    });
    renderAt('/batteries');
    await userEvent.click(await screen.findByRole('button', { name: 'Edit NG-0142' }));
    const rated = screen.getByLabelText('Rated capacity (Ah)');
    expect((rated as HTMLInputElement).value).toBe('35');
    await userEvent.clear(rated);
    await userEvent.type(rated, '36');
    // The maker's stated cold-charge inhibit goes into the pack's record.
    await userEvent.click(screen.getByText(/Stated protections/));
    await userEvent.type(screen.getByLabelText('Cold-charge inhibit: threshold (°C)'), '0');
    await userEvent.type(screen.getByLabelText('Cold-charge inhibit: delay (s)'), '5');
    await userEvent.click(screen.getByRole('button', { name: 'Save changes' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/batteries/4' && c.init?.method === 'PATCH')).toBe(true));
    const body = JSON.parse(String(calls.find((c) => c.init?.method === 'PATCH')?.init?.body));
    expect(body.ratedAh).toBe(36);
    expect(body.label).toBe('NG-0142');
    expect(body.protectionSpecs).toEqual([{ protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, releaseValue: null, thresholdTolerance: null, delayToleranceSeconds: null }]);
  });

  it('gives the rated energy in kWh when the lab has chosen kWh', async () => {
    stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack] } };
      if (url === '/api/settings') return { status: 200, body: { settings: { energyUnit: 'kWh' } } };
      return undefined;
    });
    renderAt('/batteries');
    // 420 Wh = 0.420 kWh (SI prefix kilo = 1000).
    expect(await screen.findByText('35.00 Ah · 0.420 kWh')).toBeTruthy();
  });

  it("shows a pack's protection record, latest first, each row linked to the stretch of its run", async () => {
    const result = {
      unit: '°C', channel: 'cell', expectedDelaySeconds: 5, expectedReleaseValue: 3, thresholdTolerance: 2, delayToleranceSeconds: 1.5,
      measuredDelaySeconds: 5, releaseValue: 3, resumeSeconds: 545, beyondAtStart: false, meanHeaterAmps: null, peakHeaterAmps: null, trips: 1, notes: [],
    };
    const rows = [
      { ...result, protection: 'cold-charge', expectedValue: 0, measuredValue: -0.1, outcome: 'pass', window: { fromSeconds: 170, toSeconds: 780 }, runId: 9, runName: 'Winter recheck', runState: 'finished', startedAt: now, endedAt: now },
      { ...result, protection: 'cold-charge', expectedValue: 0, measuredValue: -3.2, outcome: 'fail', window: null, runId: 2, runName: 'Intake check', runState: 'finished', startedAt: now, endedAt: now },
    ];
    const { calls } = stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack] } };
      if (url === '/api/batteries/4/protections') return { status: 200, body: { batteryId: 4, specs: [], rows } };
      return undefined;
    });
    renderAt('/batteries');
    await userEvent.click(await screen.findByRole('button', { name: 'Protections of NG-0142' }));
    const table = await screen.findByRole('table', { name: 'Protection record' });
    const lines = within(table).getAllByRole('row').slice(1);
    expect(lines.map((l) => l.textContent)).toEqual([expect.stringMatching(/Winter recheck.*Cold-charge inhibit.*-0\.1 °C.*Pass/), expect.stringMatching(/Intake check.*-3\.2 °C.*Fail/)]);
    expect(within(lines[0]!).getByRole('link', { name: 'Winter recheck' }).getAttribute('href')).toBe('/runs/9?from=170&to=780');
    expect(calls.some((c) => c.url === '/api/batteries/4/protections')).toBe(true);
  });
});
