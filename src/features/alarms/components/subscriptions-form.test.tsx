import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

describe('alarms page', () => {
  it('shows the caution beside my subscriptions and saves only mine', async () => {
    const { calls } = stubApi(demoUser('viewer'), (url, init) => {
      if (url === '/api/alarms/subscriptions' && init?.method === 'PUT') return { status: 200, body: JSON.parse(String(init.body)) };
      if (url === '/api/alarms/subscriptions') return { status: 200, body: { subscriptions: [] } };
      if (url === '/api/alarms/channels') return { status: 200, body: { channels: ['in-app', 'email'] } };
      if (url === '/api/benches') return { status: 200, body: { benches: [] } };
      return undefined;
    });
    renderAt('/alarms');
    expect((await screen.findByRole('note')).textContent).toMatch(/unattended test needs someone told at once.*local codes/);
    await userEvent.click(screen.getByRole('button', { name: 'Add' }));
    await userEvent.click(screen.getByRole('button', { name: 'Save my alarms' }));
    await waitFor(() => expect(screen.getByText('Saved.').getAttribute('role')).toBe('status'));
    const put = calls.find((c) => c.init?.method === 'PUT')!;
    expect(JSON.parse(String(put.init!.body))).toEqual({ subscriptions: [{ benchId: null, kind: 'cutoff', channel: 'email' }] });
    // Push is listed but cannot be chosen where the server has no push channel.
    expect((screen.getByRole('option', { name: /Push to this browser \(not set up here\)/ }) as HTMLOptionElement).disabled).toBe(true);
    // No outbox for a viewer.
    expect(screen.queryByText(/Outbox/)).toBeNull();
  });
});
