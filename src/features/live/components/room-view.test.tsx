import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
import type { ServerMessage, Topic } from '../../../../shared/schemas/ws';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
const status = { state: 'receiving' as const, framesOk: 10, framesRejected: 0 };
// A demo run of a fictional 12.8 V 100 Ah pack.
const recording: Run = {
  id: 41, name: 'Voltara 12 V at 600 W', tags: [], origin: 'live', benchId: 1, batteryId: 1, kind: 'capacity-discharge',
  state: 'recording', endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'after-recovery', targetAh: null,
  targetWh: null, afterRecoverySeconds: 0, readingsCount: 0, summary: null, startedAt: now, endedAt: null, createdBy: 1,
  createdAt: now, updatedAt: now,
};
const finished: Run = { ...recording, state: 'finished', endedAt: now };
const empty = { t: [], volts: [], amps: [], watts: [], temps: {} };

describe('room view', () => {
  it('keeps a run that ended on the big screen, with its unacknowledged cutoff alarm', async () => {
    stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/benches/1') return { status: 200, body: { bench: { id: 1, name: 'Bench A', source: { kind: 'none' }, enabled: true, notes: '', createdAt: now, updatedAt: now, status } } };
      if (url.startsWith('/api/runs?benchId=1')) return { status: 200, body: { runs: [], total: 0 } };
      if (url.startsWith('/api/runs/41/readings')) return { status: 404, body: { error: { message: 'Not found' } } };
      return undefined;
    });
    const listeners = new Map<string, (m: ServerMessage) => void>();
    const socket = {
      state: 'open' as const,
      onState: () => () => undefined,
      subscribe: (topic: Topic, listener: (m: ServerMessage) => void) => {
        listeners.set(topic.kind, listener);
        queueMicrotask(() => listener({ type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status, run: recording, recent: empty, events: [] }));
        return () => undefined;
      },
    };
    renderAt('/benches/1/room', socket);
    await waitFor(() => expect(listeners.has('run')).toBe(true));
    expect((await screen.findByTestId('room-state')).textContent).toBe('Recording');
    // The pack cuts off, recovers, and the run finishes at once (stop after recovery).
    const runTopic = { kind: 'run', id: 41 } as const;
    listeners.get('run')!({ type: 'event', topic: runTopic, eventId: 1, event: { elapsedSeconds: 7091, type: 'cutoff', cause: 'protection', volts: 10.65, amps: 46.9, dischargeWh: 1181.8, dischargeAh: 92.06 } });
    listeners.get('run')!({ type: 'run', topic: runTopic, run: finished });
    listeners.get('bench')!({ type: 'run', topic: { kind: 'bench', id: 1 }, run: finished });
    await waitFor(() => expect(screen.getByTestId('room-state').textContent).toBe('Finished'));
    expect(screen.getByRole('alert').textContent).toContain('CUTOFF');
  });
});
