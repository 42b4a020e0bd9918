import { QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { SIM_LOAD_SCPI } from '../../../../shared/schemas/instrument-presets';
import { createQueryClient } from '../../../lib/query-client';
import { demoUser, stubApi } from '../../../testing/render-app';
import { BenchInstrumentsForm } from './bench-instruments-form';

afterEach(() => vi.unstubAllGlobals());

describe('the bench instruments form', () => {
  it("sets the bench's load to the simulator's SCPI words on a port, leaving the supply out", async () => {
    const { calls } = stubApi(demoUser('admin'), (url, init) => {
      if (url !== '/api/benches/3/instruments') return undefined;
      if (init?.method === 'PUT') return { status: 200, body: { instruments: JSON.parse(String(init.body)) } };
      return { status: 200, body: { instruments: { load: null, supply: null } } };
    });
    const client = createQueryClient();
    client.setDefaultOptions({ queries: { retry: false } });
    render(
      <QueryClientProvider client={client}>
        <BenchInstrumentsForm benchId={3} />
      </QueryClientProvider>,
    );
    await userEvent.selectOptions(await screen.findByLabelText('Electronic load'), 'scpi');
    await userEvent.type(screen.getByLabelText('Electronic load port'), '/tmp/kp-load');
    await userEvent.click(screen.getByRole('button', { name: 'Save instruments' }));
    await waitFor(() => expect(calls.some((c) => c.init?.method === 'PUT')).toBe(true));
    const body = JSON.parse(String(calls.find((c) => c.init?.method === 'PUT')!.init!.body));
    expect(body).toEqual({ load: { protocol: 'scpi', id: 'load', role: 'load', port: { path: '/tmp/kp-load' }, commands: SIM_LOAD_SCPI }, supply: null });
    expect(await screen.findByText('Saved.')).toBeTruthy();
  });
});
