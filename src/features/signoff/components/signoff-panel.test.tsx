import { fireEvent, render, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { SignoffHistoryResponse } from '../../../../shared/schemas/signoff';
import { AppProvider } from '../../../app/provider';
import { createQueryClient } from '../../../lib/query-client';
import { queryKeys } from '../../../lib/queries/query-keys';
import type { Role } from '../../../lib/roles';
import { stubApi } from '../../../testing/render-app';
import { SignoffPanel } from './signoff-panel';

const HASH = 'c'.repeat(64);
const entry = (id: number, action: 'ready' | 'signed', state: 'current' | 'superseded', comment: string) => ({
  id, runId: 3, action, comment, contentHash: HASH, byId: 1, byName: action === 'signed' ? 'Ada Marsh' : 'Ben Okafor', byRole: action === 'signed' ? 'admin' : 'technician', at: '2026-11-30T09:00:00.000Z', state,
});

function renderPanel(role: Role, history: SignoffHistoryResponse, client = createQueryClient()) {
  const { calls } = stubApi(null, (url, init) => {
    if (url === '/api/runs/3/signoffs' && (init?.method ?? 'GET') === 'GET') return { status: 200, body: history };
    if (url.startsWith('/api/runs/3/signoffs') && init?.method === 'POST') return { status: 201, body: history };
    return undefined;
  });
  render(
    <AppProvider queryClient={client}>
      <SignoffPanel runId={3} role={role} formatTime={(iso) => iso} />
    </AppProvider>,
  );
  return calls;
}

afterEach(() => vi.unstubAllGlobals());

describe('sign-off panel', () => {
  it('offers a viewer nothing to press, and shows the history', async () => {
    renderPanel('viewer', { status: 'signed', currentHash: HASH, entries: [entry(2, 'signed', 'current', 'Meets rating'), entry(1, 'ready', 'superseded', '')] });
    expect(await screen.findByText('Signed off.')).toBeTruthy();
    expect(screen.queryByRole('button')).toBeNull();
    expect(screen.getByRole('list', { name: 'Review history' }).querySelectorAll('li')).toHaveLength(2);
  });

  it('lets a technician mark a superseded run ready, but not sign it', async () => {
    const calls = renderPanel('technician', { status: 'superseded', currentHash: HASH, entries: [entry(2, 'signed', 'superseded', 'Old sign-off')] });
    expect(await screen.findByText(/no longer holds/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Sign off' })).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Mark ready for review' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/runs/3/signoffs/ready' && c.init?.method === 'POST')).toBe(true));
  });

  it('asks again when the page learns the run or its notes changed (a change can supersede the sign-off)', async () => {
    const client = createQueryClient();
    const calls = renderPanel('viewer', { status: 'signed', currentHash: HASH, entries: [entry(2, 'signed', 'current', 'ok')] }, client);
    await screen.findByText('Signed off.');
    const asked = () => calls.filter((c) => c.url === '/api/runs/3/signoffs').length;
    expect(asked()).toBe(1);
    client.setQueryData(queryKeys.runs.events(3), []);
    await waitFor(() => expect(asked()).toBe(2));
    client.setQueryData(queryKeys.runs.events(4), []);
    client.setQueryData(queryKeys.runs.detail(3), { id: 3 });
    await waitFor(() => expect(asked()).toBe(3));
  });

  it('lets an admin sign a ready run with a comment and the hash of what they looked at', async () => {
    const calls = renderPanel('admin', { status: 'ready', currentHash: HASH, entries: [entry(1, 'ready', 'current', 'please check')] });
    const button = await screen.findByRole('button', { name: 'Sign off' });
    expect((button as HTMLButtonElement).disabled).toBe(true);
    fireEvent.change(screen.getByLabelText('Sign-off comment'), { target: { value: 'Checked' } });
    fireEvent.click(button);
    await waitFor(() => {
      const post = calls.find((c) => c.url === '/api/runs/3/signoffs' && c.init?.method === 'POST');
      expect(JSON.parse(String(post?.init?.body))).toEqual({ comment: 'Checked', contentHash: HASH });
    });
  });
});
