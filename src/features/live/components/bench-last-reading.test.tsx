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
            listener({ type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status, run: null, recent: { t: [], volts: [], amps: [], watts: [], temps: {} }, events: [] });
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

  it('counts frames as readings arrive, and dims stale numbers with their age', async () => {
    const longAgo = new Date(Date.now() - TEN_MINUTES_MS).toISOString();
    const status = { state: 'receiving' as const, framesOk: 10, framesRejected: 0, lastFrameAt: longAgo };
    stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/benches/1') return { status: 200, body: { bench: { id: 1, name: 'Bench A', source: { kind: 'none' }, enabled: true, notes: '', createdAt: longAgo, updatedAt: longAgo, status } } };
      if (url.startsWith('/api/runs?benchId=1')) return { status: 200, body: { runs: [], total: 0 } };
      return undefined;
    });
    let push: ((m: ServerMessage) => void) | null = null;
    const socket = {
      state: 'open' as const,
      onState: () => () => undefined,
      subscribe: (topic: Topic, listener: (m: ServerMessage) => void) => {
        if (topic.kind === 'bench') {
          push = listener;
          queueMicrotask(() => listener({ type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status, run: null, recent: { t: [1], volts: [13.2], amps: [45], watts: [594], temps: {} }, events: [] }));
        }
        return () => undefined;
      },
    };
    renderAt('/benches/1', socket);
    // Ten minutes without a reading: the numbers are dimmed and say how old they are.
    expect((await screen.findByTestId('reading-age')).textContent).toMatch(/last reading 10 min/);
    expect(screen.getByTestId('big-volts').dataset.stale).toBe('true');
    expect(screen.getByText(/10 frames ok/)).toBeTruthy();
    // Three readings arrive: the count moves with them and the numbers are current again.
    const readings = { t: [600, 601, 602], volts: [13.1, 13.1, 13.1], amps: [45.8, 45.8, 45.8], watts: [600, 600, 600], temps: {} };
    push!({ type: 'batch', seq: 2, topic: { kind: 'bench', id: 1 }, readings, dropped: 0 });
    expect(await screen.findByText(/13 frames ok/)).toBeTruthy();
    expect(screen.queryByTestId('reading-age')).toBeNull();
    expect(screen.getByTestId('big-volts').dataset.stale).toBeUndefined();
  });
});
