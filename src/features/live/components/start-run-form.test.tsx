import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Battery } from '../../../../shared/schemas/battery';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
// A fictional pack of the demo lab, with a low-temperature charge cutoff to check.
const pack: Battery = {
  id: 3, label: 'Kestrel 12 V camper', brand: 'Kestrel Energy', model: 'Nomad 12-50', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1,
  ratedAh: 50, ratedWh: 640, bmsRatedAmps: 50, massKg: 6.2, price: null, priceCurrency: null, serialNumber: null,
  sender: null, notes: null, receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null,
  terminalType: null, statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: now, updatedAt: now,
};

describe('start form: protection check', () => {
  it('sends protections typed in °F in °C, and refuses a limit typed without its box ticked', async () => {
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url === '/api/benches/2') return { status: 200, body: { bench: { id: 2, name: 'Bench B', source: { kind: 'none' }, enabled: true, notes: '', createdAt: now, updatedAt: now, status: { state: 'idle', framesOk: 0, framesRejected: 0 } } } };
      if (url.startsWith('/api/runs?benchId=2')) return { status: 200, body: { runs: [], total: 0 } };
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack] } };
      if (url === '/api/settings') return { status: 200, body: { settings: { temperatureUnit: 'F' } } };
      if (url === '/api/runs' && init?.method === 'POST') return { status: 400, body: { error: { message: 'stop here' } } };
      return undefined;
    });
    renderAt('/benches/2');
    await userEvent.selectOptions(await screen.findByLabelText('Battery pack'), '3');
    await userEvent.type(screen.getByLabelText('Run name'), 'Kestrel cold charge inhibit');
    await userEvent.selectOptions(screen.getByLabelText('Kind of test'), 'protection-check');
    // The lab works in °F: the common cold limit (0 °C) is offered as 32 °F, and typed limits are °F.
    const cold = screen.getByLabelText('Cold-charge inhibit: threshold (°F)') as HTMLInputElement;
    expect(cold.placeholder).toMatch(/^32 /);
    await userEvent.click(screen.getByRole('checkbox', { name: 'Cold-charge inhibit' }));
    await userEvent.type(cold, '41');
    await userEvent.type(screen.getByLabelText('Cold-charge inhibit: delay (s)'), '5');
    // A hot limit typed without ticking its box is refused, not silently ignored (issue 11 item 7).
    await userEvent.type(screen.getByLabelText('Over-temperature, discharging: threshold (°F)'), '140');
    await userEvent.click(screen.getByRole('button', { name: 'Arm the run' }));
    expect(await screen.findByText(/Tick the box to check this protection/)).toBeTruthy();
    expect(calls.some((c) => c.url === '/api/runs' && c.init?.method === 'POST')).toBe(false);
    await userEvent.click(screen.getByRole('checkbox', { name: 'Over-temperature, discharging' }));
    await userEvent.click(screen.getByRole('button', { name: 'Arm the run' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/runs' && c.init?.method === 'POST')).toBe(true));
    const body = JSON.parse(String(calls.find((c) => c.url === '/api/runs' && c.init?.method === 'POST')!.init!.body));
    expect(body.kind).toBe('protection-check');
    expect(body.protectionChecks).toHaveLength(2);
    // 41 °F = 5 °C and 140 °F = 60 °C (°C = (°F − 32) × 5/9).
    expect(body.protectionChecks[0]).toMatchObject({ protection: 'cold-charge', channel: 'cell', delaySeconds: 5 });
    expect(body.protectionChecks[0].thresholdValue).toBeCloseTo(5, 9);
    expect(body.protectionChecks[1]).toMatchObject({ protection: 'over-temp-discharge', channel: 'cell' });
    expect(body.protectionChecks[1].thresholdValue).toBeCloseTo(60, 9);
  });
});
