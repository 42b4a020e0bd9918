import { QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { RunProgramme } from '../../../../shared/schemas/programme-run';
import { createQueryClient } from '../../../lib/query-client';
import { demoUser, stubApi } from '../../../testing/render-app';
import { RunProgrammePanel } from './run-programme-panel';

afterEach(() => vi.unstubAllGlobals());

// A made-up programme of the demo lab (Northgate Cell Lab), half way through.
const NOW_MS = Date.UTC(2026, 11, 2, 9, 0, 0);
const running: RunProgramme = {
  runId: 5, programmeId: 2,
  programme: { name: 'Full capacity, 8s LFP', chemistry: 'lfp', cellsInSeries: 8, maxCurrentAmps: 50, steps: [{ kind: 'charge', volts: 28.8, currentAmps: 10, taperAmps: 0.5 }, { kind: 'rest', maxSeconds: 600 }, { kind: 'discharge', mode: 'cc', value: 10, endVolts: 22 }, { kind: 'rest', maxSeconds: 600 }] },
  stepLabels: ['1 charge', '2 rest', '3 discharge', '4 rest'],
  state: 'running', currentIndex: 1, stepStartedAtMs: NOW_MS - 125_000, serverNowMs: NOW_MS,
  results: [{ index: 0, label: '1 charge', kind: 'charge', outcome: 'done', cause: 'taper', reason: 'taper current reached (0.500 A at 28.800 V)', startElapsedSeconds: 0, endElapsedSeconds: 3600, chargeAh: 10.5, chargeWh: 300.2, dischargeAh: 0, dischargeWh: 0, endVolts: 28.8 }],
  roundTrips: [], failReason: null, floorVolts: 20, watchdogArmed: ['load-1'], cautionsAcknowledgedBy: 'Northgate technician',
};

function renderPanel(canAct: boolean, programme: RunProgramme | null, live = true) {
  const { calls } = stubApi(demoUser(canAct ? 'technician' : 'viewer'), (url, init) => {
    if (url === '/api/runs/5/programme' && (!init?.method || init.method === 'GET'))
      return programme ? { status: 200, body: { programme } } : { status: 404, body: { error: { message: 'not found' } } };
    if (url === '/api/runs/5/programme/control') return { status: 200, body: { programme: { ...running, state: 'paused' } } };
    if (url === '/api/programmes') return { status: 200, body: { programmes: [{ id: 2, name: 'Full capacity, 8s LFP', description: null, chemistry: 'lfp', cellsInSeries: 8, maxCurrentAmps: 50, steps: [{ kind: 'rest', maxSeconds: 60 }], createdAt: '2026-12-01T00:00:00Z', updatedAt: '2026-12-01T00:00:00Z' }] } };
    if (url === '/api/runs/5/programme') return { status: 201, body: { programme: running } };
    return undefined;
  });
  const client = createQueryClient();
  client.setDefaultOptions({ queries: { retry: false } });
  render(
    <QueryClientProvider client={client}>
      <RunProgrammePanel runId={5} canAct={canAct} live={live} />
    </QueryClientProvider>,
  );
  return calls;
}

describe('the run programme panel', () => {
  it('shows the current step, its time and the steps to come, and a technician pauses it', async () => {
    const calls = renderPanel(true, running);
    expect(await screen.findByTestId('current-step')).toHaveProperty('textContent', expect.stringMatching(/^Now: 2 rest · 2 min 0[56] s in step$/)); // the server's 125 s, plus the moment since it answered
    expect(within(screen.getByRole('list', { name: 'Steps to come' })).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['3 discharge', '4 rest']);
    expect(screen.getByRole('table', { name: 'Step results' }).textContent).toMatch(/taper current reached/);
    await userEvent.click(screen.getByRole('button', { name: 'Pause step' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/runs/5/programme/control' && String(c.init?.body).includes('"pause"'))).toBe(true));
    expect(await screen.findByRole('button', { name: 'Resume step' })).toBeTruthy();
  });

  it('gives a viewer no step control', async () => {
    renderPanel(false, running);
    await screen.findByTestId('current-step');
    expect(screen.queryByRole('button', { name: /Pause|Skip|Abort/ })).toBeNull();
  });

  it('starts a programme only once the cautions are acknowledged', async () => {
    const calls = renderPanel(true, null);
    const start = await screen.findByRole('button', { name: 'Start programme' });
    await userEvent.selectOptions(await screen.findByLabelText('Programme'), '2');
    expect(start).toHaveProperty('disabled', true);
    expect(screen.getByRole('region', { name: 'Cautions before a programme' }).textContent).toMatch(/local codes/);
    await userEvent.click(screen.getByRole('checkbox', { name: /I have read these cautions/ }));
    await userEvent.click(start);
    await waitFor(() => expect(calls.some((c) => c.url === '/api/runs/5/programme' && c.init?.method === 'POST' && String(c.init.body).includes('"acknowledgeCautions":true'))).toBe(true));
  });
});
