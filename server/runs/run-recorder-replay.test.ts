import { describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import type { Run } from '../../shared/schemas/run.js';
import { measureConfigFor } from './measure-config.js';
import type { RunBatch } from './run-batch.js';
import { RunRecorder, type KeptReading } from './run-recorder.js';
import { RunSession } from './run-session.js';
import type { RunsRepo } from './runs-repo.js';
import { quietLogger } from '../log/logger.js';

const run: Run = {
  id: 4, name: 'r', tags: [], origin: 'live', benchId: 2, batteryId: null, kind: 'capacity-discharge', state: 'recording',
  endVolts: null, acceptancePercent: 100, alarms: { onCutoff: false }, stopWhen: 'manual', targetAh: null, targetWh: null,
  afterRecoverySeconds: 0, readingsCount: 0, summary: null, startedAt: null, endedAt: null, createdBy: null, createdAt: '', updatedAt: '',
};
const frame = (i: number): Frame => ({ t: 100 + i * 0.5, volts: 12.9 - i * 0.001, amps: 8 + (i % 3), clock: 'device' });
const kept = (from: number, to: number): KeptReading[] => Array.from({ length: to - from }, (_, k) => ({ index: from + k, frame: frame(from + k), arrivalSeconds: 1_700_000_000 + from + k }));

/** A recorder resumed from the archived state after `archived` readings, as at a start after a crash. */
async function resumedAt(archived: number): Promise<{ recorder: RunRecorder; batches: RunBatch[] }> {
  const before = new RunSession(run, null, measureConfigFor(run, null));
  for (let i = 0; i < archived; i++) before.push(frame(i));
  const stored = before.takeBatch().patch.pipelineState!;
  const batches: RunBatch[] = [];
  const repo = { listLive: async () => [run], getPipelineState: async () => stored, events: async () => [] } as unknown as RunsRepo;
  const archive = { enqueue: (b: RunBatch) => void batches.push(b) };
  const recorder = new RunRecorder({ repo, archive, getBattery: async () => null, log: quietLogger });
  await recorder.resume();
  return { recorder, batches };
}

describe('RunRecorder.replay', () => {
  it('pushes the kept readings past the archive back through the run: same totals as a run that never stopped', async () => {
    const straight = new RunSession(run, null, measureConfigFor(run, null));
    for (let i = 0; i < 30; i++) straight.push(frame(i));
    const { recorder } = await resumedAt(20);
    // The journal also holds readings the archive already has (indexes 15 to 19): skipped.
    expect(recorder.replay(run.id, kept(15, 30))).toBe(10);
    const session = recorder.session(run.id)!;
    expect(session.readingsCount).toBe(30);
    expect(session.pipeline.totals()).toEqual(straight.pipeline.totals());
  });

  it('stops where the indexes no longer follow on, and carries the meter clock on after the last one', async () => {
    const { recorder } = await resumedAt(10);
    const withHole = [...kept(10, 14), ...kept(16, 20)];
    expect(recorder.replay(run.id, withHole)).toBe(4);
    const session = recorder.session(run.id)!;
    expect(session.readingsCount).toBe(14);
    expect(session.clock.state.lastT).toBe(frame(13).t);
    expect(session.clock.state.lastArrivalSeconds).toBe(1_700_000_013);
  });
});
