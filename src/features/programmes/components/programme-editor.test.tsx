import { QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { createQueryClient } from '../../../lib/query-client';
import { demoUser, stubApi } from '../../../testing/render-app';
import { ProgrammeEditor } from './programme-editor';

afterEach(() => vi.unstubAllGlobals());

const FLOOR_MESSAGE = "End voltage 19 V is below this pack's floor of 20 V (the lfp floor, or the protection's cutoff plus margin)";

function renderEditor() {
  const { calls } = stubApi(demoUser('technician'), (url, init) =>
    url === '/api/programmes' && init?.method === 'POST'
      ? { status: 400, body: { error: { message: `Unsafe programme: ${FLOOR_MESSAGE}`, fields: { 'steps.0.endVolts': [FLOOR_MESSAGE] } } } }
      : undefined,
  );
  const client = createQueryClient();
  client.setDefaultOptions({ queries: { retry: false } });
  const onDone = vi.fn();
  render(
    <QueryClientProvider client={client}>
      <ProgrammeEditor programme={null} onDone={onDone} />
    </QueryClientProvider>,
  );
  return { calls, onDone };
}

describe('the programme editor', () => {
  it('sends only the fields of each step kind, and shows the server\u2019s refusal beside the field', async () => {
    const { calls, onDone } = renderEditor();
    await userEvent.type(screen.getByLabelText('Name'), 'Capacity 8s');
    await userEvent.clear(screen.getByLabelText('Cells in series'));
    await userEvent.type(screen.getByLabelText('Cells in series'), '8');
    await userEvent.type(screen.getByLabelText('Pack protection rating, A'), '100');
    await userEvent.selectOptions(screen.getByLabelText('Step'), 'discharge');
    await userEvent.type(screen.getByLabelText('Set value (A, W or Ω)'), '10');
    await userEvent.type(screen.getByLabelText('End voltage, V (pack)'), '19');
    await userEvent.click(screen.getByRole('button', { name: 'Save programme' }));
    await waitFor(() => expect(calls.some((c) => c.init?.method === 'POST')).toBe(true));
    const sent = JSON.parse(String(calls.find((c) => c.init?.method === 'POST')!.init!.body));
    expect(sent).toEqual({ name: 'Capacity 8s', chemistry: 'lfp', cellsInSeries: 8, maxCurrentAmps: 100, steps: [{ kind: 'discharge', mode: 'cc', value: 10, endVolts: 19 }] });
    expect(await screen.findByText(FLOOR_MESSAGE)).toBeTruthy();
    expect(onDone).not.toHaveBeenCalled();
  });

  it('refuses, before sending, a charge with neither a taper current nor a time', async () => {
    const { calls } = renderEditor();
    await userEvent.type(screen.getByLabelText('Name'), 'Charge only');
    await userEvent.type(screen.getByLabelText('Pack protection rating, A'), '100');
    await userEvent.type(screen.getByLabelText('Charge to, V (pack)'), '3.6');
    await userEvent.type(screen.getByLabelText('Charge current, A'), '5');
    await userEvent.click(screen.getByRole('button', { name: 'Save programme' }));
    expect((await screen.findByRole('alert')).textContent).toMatch(/taper current or after a time/);
    expect(calls.some((c) => c.init?.method === 'POST')).toBe(false);
  });
});
