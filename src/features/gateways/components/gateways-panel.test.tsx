import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const gateway = {
  id: 3, name: 'room-2', username: 'gateway-room-2', revoked: false, benchIds: [5], createdAt: '2026-12-01T20:00:00Z',
  state: { online: true, lastSeenAt: new Date().toISOString(), clockOffsetMs: -42, outboxDepth: 17 },
};
const answers = (mqtt: boolean, gateways: unknown[]) => (url: string, init?: RequestInit) => {
  if (url === '/api/gateways' && (init?.method ?? 'GET') === 'GET') return { status: 200, body: { mqtt, gateways } };
  if (url === '/api/benches') return { status: 200, body: { benches: [] } };
  if (url === '/api/gateways' && init?.method === 'POST') return { status: 201, body: { gateway: { ...gateway, id: 4, name: 'room-3', benchIds: [] }, password: 'shown-once-secret' } };
  return undefined;
};

describe('gateways on the board', () => {
  it('shows each gateway’s state, clock offset and outbox depth to a viewer, without admin controls', async () => {
    stubApi(demoUser('viewer'), answers(true, [gateway]));
    renderAt('/');
    expect(await screen.findByText('room-2')).toBeTruthy();
    expect(screen.getByText('online')).toBeTruthy();
    expect(screen.getByText('-42 ms')).toBeTruthy();
    expect(screen.getByText('17')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Register gateway' })).toBeNull();
  });

  it('stays away when MQTT is not configured', async () => {
    const { calls } = stubApi(demoUser('admin'), answers(false, []));
    renderAt('/');
    await waitFor(() => expect(calls.some((c) => c.url === '/api/gateways')).toBe(true));
    await screen.findByText('No benches yet');
    expect(screen.queryByText('Bench gateways')).toBeNull();
  });

  it('lets an admin register a gateway and shows its password once', async () => {
    const { calls } = stubApi(demoUser('admin'), answers(true, [gateway]));
    renderAt('/');
    await userEvent.type(await screen.findByLabelText('New gateway name'), 'room-3');
    await userEvent.click(screen.getByRole('button', { name: 'Register gateway' }));
    expect(await screen.findByText('shown-once-secret')).toBeTruthy();
    const post = calls.find((c) => c.url === '/api/gateways' && c.init?.method === 'POST');
    expect(JSON.parse(String(post?.init?.body))).toEqual({ name: 'room-3' });
  });
});
