import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { ServerMessage, Topic } from '../../../../shared/schemas/ws';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const TEN_MINUTES_MS = 10 * 60_000;

describe('bench page: age of the last reading', () => {
  it('counts from the latest live batch, not from the last status change', async () => {
    // The server sends a status only when the bench's state changes: while readings stream,
    // its lastFrameAt grows old although the bench is receiving.
    const longAgo = new Date(Date.now() - TEN_MINUTES_MS).toISOString();
    const status = { state: 'receiving' as const, framesOk: 10, framesRejected: 0, lastFrameAt: longAgo };
    const now = longAgo;
    stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/benches/1') return { status: 200, body: { bench: { id: 1, name: 'Bench A', source: { kind: 'none' }, enabled: true, notes: '', createdAt: now, updatedAt: now, status } } };
      if (url.startsWith('/api/runs?benchId=1')) return { status: 200, body: { runs: [], total: 0 } };
      return undefined;
    });
    const readings = { t: [600], volts: [13.1], amps: [45.8], watts: [600], temps: {} };
    const socket = {
      state: 'open' as const,
      onState: () => () => undefined,
      subscribe: (topic: Topic, listener: (m: ServerMessage) => void) => {
        if (topic.kind === 'bench') {
          queueMicrotask(() => {
            listener({ type: 'snapshot', seq: 1, topic, status, run: null, recent: { t: [], volts: [], amps: [], watts: [], temps: {} }, events: [] });
            listener({ type: 'batch', seq: 2, topic, readings, dropped: 0 });
          });
        }
        return () => undefined;
      },
    };
    renderAt('/benches/1', socket);
    expect(await screen.findByText(/^last reading \d+ s ago$/)).toBeTruthy();
    expect(screen.queryByText(/last reading 10 min/)).toBeNull();
    // No run records here: the meter's own clock is not a run time.
    expect(screen.getByTestId('big-volts').textContent).toBe('13.10');
    expect(screen.queryByTestId('big-run-time')).toBeNull();
  });
});
