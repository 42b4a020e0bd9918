import { fireEvent, screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Run } from '../../../../shared/schemas/run';
import type { PublicUser } from '../../../../shared/schemas/user';
import { demoUser, fakeLiveSocket, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
const bench = {
  id: 1, name: 'Bench A', source: { kind: 'none' }, enabled: true, notes: '', createdAt: now, updatedAt: now,
  status: { state: 'receiving', framesOk: 10, framesRejected: 0 },
};
const run: Run = {
  id: 31, name: 'Hollis e-bike 36 V at 0.5 C', tags: [], origin: 'live', benchId: 1, batteryId: 1, kind: 'capacity-discharge',
  state: 'recording', endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'manual', targetAh: null,
  targetWh: null, afterRecoverySeconds: 0, readingsCount: 0, summary: null, startedAt: now, endedAt: null, createdBy: 1,
  createdAt: now, updatedAt: now,
};

function openBenchAs(user: PublicUser, status: object = bench.status) {
  stubApi(user, (url, init) => {
    if (url === '/api/runs/31/events' && init?.method === 'POST') return { status: 201, body: {} };
    if (url === '/api/benches/1') return { status: 200, body: { bench: { ...bench, status } } };
    if (url.startsWith('/api/runs?benchId=1')) return { status: 200, body: { runs: [run], total: 1 } };
    return undefined;
  });
  const socket = fakeLiveSocket((topic) =>
    topic.kind === 'run'
      ? { type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status: null, run, recent: { elapsedSeconds: [], volts: [], amps: [], watts: [], temps: {} }, events: [] }
      : null,
  );
  renderAt('/benches/1', socket);
}

describe('bench page by role', () => {
  it('gives a technician the note box and the finish and abort buttons', async () => {
    openBenchAs(demoUser('technician'));
    expect(await screen.findByRole('button', { name: 'Finish run' })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Abort' })).toBeTruthy();
    expect(screen.getByLabelText(/Note on this run/)).toBeTruthy();
  });

  it('lets a viewer watch the run but change nothing', async () => {
    openBenchAs(demoUser('viewer'));
    expect(await screen.findByRole('heading', { name: run.name })).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Finish run' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Abort' })).toBeNull();
    expect(screen.queryByLabelText(/Note on this run/)).toBeNull();
  });

  it('says plainly when the meter has gone quiet during a run', async () => {
    openBenchAs(demoUser('technician'), { state: 'stale', message: 'no data for 12 s', framesOk: 10, framesRejected: 0 });
    expect((await screen.findByText(/Meter not delivering: no data for 12 s/)).textContent).toContain('integrates nothing across it');
  });

  it('leaves the note box once a note is saved, so the next key is a shortcut again', async () => {
    openBenchAs(demoUser('technician'));
    const box = await screen.findByLabelText(/Note on this run/);
    box.focus();
    fireEvent.change(box, { target: { value: 'Fan on, ambient 22 °C' } });
    fireEvent.keyDown(box, { key: 'Enter' });
    await waitFor(() => expect((box as HTMLTextAreaElement).value).toBe(''));
    expect(document.activeElement).not.toBe(box);
  });
});
