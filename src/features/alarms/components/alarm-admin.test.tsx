import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

describe('alarm administration', () => {
  it('lets an admin set the on-call order and shelve a kind with a reason', async () => {
    // A bench and two people of the fictional demo lab, as the API returns them.
    const bench = {
      id: 4, name: 'Bench 4', source: { kind: 'none' }, enabled: true, notes: '', loadOnAmps: null,
      createdAt: '2026-12-01T10:00:00.000Z', updatedAt: '2026-12-01T10:00:00.000Z', status: { state: 'idle', framesOk: 0, framesRejected: 0 },
    };
    const first = { ...demoUser('technician'), id: 11 };
    const second = { ...demoUser('viewer'), id: 12 };
    const { calls } = stubApi(demoUser('admin'), (url, init) => {
      if (init?.method === 'PUT' && url === '/api/alarms/on-call/4') return { status: 200, body: { onCall: [] } };
      if (init?.method === 'POST' && url === '/api/alarms/shelves') return { status: 201, body: { shelf: { id: 1, benchId: 4, kind: 'source-lost', reason: 'meter swap', shelvedBy: null, shelvedAt: '2026-12-01T10:00:00.000Z', until: '2026-12-01T10:30:00.000Z', endedAt: null, endedBy: null } } };
      const answers: Record<string, unknown> = {
        '/api/alarms/subscriptions': { subscriptions: [] },
        '/api/alarms/channels': { channels: ['in-app', 'email'] },
        '/api/alarms/settings': { settings: { escalateAfterMinutes: 10, sourceLostSeconds: 60, nearEndMinutes: 15 } },
        '/api/alarms/shelves': { shelves: [] },
        '/api/alarms/outbox': { messages: [], fakeSmtp: null },
        '/api/alarms/on-call/4': { onCall: [] },
        '/api/benches': { benches: [bench] },
        '/api/users': { users: [first, second] },
      };
      return url in answers ? { status: 200, body: answers[url] } : undefined;
    });
    renderAt('/alarms');
    const add = await screen.findByLabelText('Add to on-call');
    await userEvent.selectOptions(add, String(second.id));
    await userEvent.selectOptions(screen.getByLabelText('Add to on-call'), String(first.id));
    await userEvent.click(screen.getAllByRole('button', { name: 'Up' })[1]!);
    await userEvent.click(screen.getByRole('button', { name: 'Save on-call list' }));
    await waitFor(() => expect(calls.some((c) => c.init?.method === 'PUT' && c.url === '/api/alarms/on-call/4')).toBe(true));
    const put = calls.find((c) => c.init?.method === 'PUT' && c.url === '/api/alarms/on-call/4')!;
    expect(JSON.parse(String(put.init!.body))).toEqual({ userIds: [first.id, second.id] });

    await userEvent.selectOptions(screen.getByLabelText('Shelve alarm'), 'source-lost');
    await userEvent.clear(screen.getByLabelText('For minutes'));
    await userEvent.type(screen.getByLabelText('For minutes'), '30');
    await userEvent.type(screen.getByLabelText('Reason'), 'meter swap');
    await userEvent.click(screen.getByRole('button', { name: 'Shelve' }));
    await waitFor(() => expect(calls.some((c) => c.init?.method === 'POST' && c.url === '/api/alarms/shelves')).toBe(true));
    const post = calls.find((c) => c.init?.method === 'POST' && c.url === '/api/alarms/shelves')!;
    expect(JSON.parse(String(post.init!.body))).toEqual({ benchId: 4, kind: 'source-lost', minutes: 30, reason: 'meter swap' });
  });
});
