import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
import type { ServerMessage, Topic } from '../../../../shared/schemas/ws';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
const run: Run = {
  id: 5, name: 'Voltara pack B', tags: [], origin: 'live', benchId: null, batteryId: null, kind: 'capacity-discharge', state: 'finished',
  endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'manual', targetAh: null, targetWh: null,
  afterRecoverySeconds: 0, readingsCount: 3, summary: null, startedAt: now, endedAt: now, createdBy: 1, createdAt: now, updatedAt: now,
};
const mine = { id: 41, runId: 5, createdAt: now, createdBy: 7, event: { type: 'annotation' as const, elapsedSeconds: 60, text: 'fan on', author: 'Northgate technician' } };
const theirs = { id: 42, runId: 5, createdAt: now, createdBy: 99, event: { type: 'annotation' as const, elapsedSeconds: 90, text: 'smell of solder', author: 'Someone else' } };

function serve(eventsBody: () => unknown) {
  return stubApi(demoUser('technician'), (url, init) => {
    if (url === '/api/runs/5') return { status: 200, body: { run } };
    if (url === '/api/runs/5/events') return { status: 200, body: eventsBody() };
    if (url === '/api/runs/5/note-history') return { status: 200, body: { revisions: [] } };
    if (url.startsWith('/api/runs/5/readings')) return { status: 200, body: { runId: 5, from: 0, to: 0, reduced: false, bucketSeconds: null, readingsInWindow: 0, x: [], volts: { min: [], max: [] }, amps: { min: [], max: [] }, watts: { min: [], max: [] }, temps: {} } };
    if (url === '/api/runs/5/events/41' && init?.method === 'PATCH') return { status: 200, body: { event: { id: 41 } } };
    return undefined;
  });
}

describe('notes on the run page', () => {
  it('offers Edit and Remove on the author’s own note only, and sends the new text', async () => {
    const { calls } = serve(() => ({ events: [mine, theirs] }));
    renderAt('/runs/5');
    await screen.findByText('smell of solder');
    expect(screen.getByRole('button', { name: 'Edit note: fan on' })).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Edit note: smell of solder' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Remove note: smell of solder' })).toBeNull();
    await userEvent.click(screen.getByRole('button', { name: 'Edit note: fan on' }));
    const field = screen.getByRole('form', { name: 'Edit the note' }).querySelector('input')!;
    await userEvent.clear(field);
    await userEvent.type(field, 'fan on, 30 cm away');
    await userEvent.click(screen.getByRole('button', { name: 'Save note' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/runs/5/events/41' && c.init?.method === 'PATCH')).toBe(true));
    const patch = calls.find((c) => c.url === '/api/runs/5/events/41')!;
    expect(JSON.parse(String(patch.init!.body))).toEqual({ text: 'fan on, 30 cm away' });
  });

  it('shows another viewer’s change at once when the run’s topic says a note changed', async () => {
    let current: unknown[] = [mine, theirs];
    serve(() => ({ events: current }));
    let push: ((m: ServerMessage) => void) | null = null;
    const socket = {
      state: 'open' as const,
      onState: () => () => undefined,
      subscribe: (topic: Topic, listener: (m: ServerMessage) => void) => {
        if (topic.kind === 'run') push = listener;
        return () => undefined;
      },
    };
    renderAt('/runs/5', socket);
    await screen.findByText('smell of solder');
    current = [mine];
    push!({ type: 'note', topic: { kind: 'run', id: 5 }, eventId: 42, previous: theirs.event, event: null });
    await waitFor(() => expect(screen.queryByText('smell of solder')).toBeNull());
  });
});
