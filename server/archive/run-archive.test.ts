import { describe, expect, it } from 'vitest';
import type { Reading } from '../../shared/schemas/reading.js';
import type { RunBatch } from '../runs/run-batch.js';
import { readingAt } from '../readings/reading-columns.js';
import type { ArchiveBatch } from './archive-batch.js';
import type { ArchiveWriter } from './archive-writer.js';
import { decodeBlock } from './column-block.js';
import { archiveSink, toArchiveBatch } from './run-archive.js';

// Values made up for the round trip only; nothing here is a measurement.
const reading = (i: number): Reading => ({
  t: 500 + i, elapsedSeconds: i, volts: 13.1 - i * 0.01, amps: 4, watts: (13.1 - i * 0.01) * 4,
  dischargeWh: i * 0.0146, dischargeAh: i * 0.0011, chargeWh: 0, chargeAh: 0, clock: 'device',
  ...(i % 2 === 0 ? { temps: { cell: 21 + i } } : {}),
});

const batch = (firstSeq: number, n: number): RunBatch => ({
  runId: 9, firstSeq, readings: Array.from({ length: n }, (_, k) => reading(firstSeq + k)), events: [], patch: { readingsCount: firstSeq + n },
});

describe('the archive as a sink of runs', () => {
  it('encodes a batch of readings into its own block, numbered from the batch, that decodes to the same readings', () => {
    const stored = toArchiveBatch(batch(40, 6));
    expect([stored.block!.firstSeq, stored.block!.count, stored.block!.firstElapsedSeconds, stored.block!.lastElapsedSeconds]).toEqual([40, 6, 40, 45]);
    const cols = decodeBlock(stored.block!.layout, stored.block!.data);
    expect(Array.from({ length: 6 }, (_, i) => readingAt(cols, i))).toEqual(batch(40, 6).readings);
  });

  it('stores a batch without readings (events or a state change only) without a block', () => {
    expect(toArchiveBatch(batch(7, 0)).block).toBeNull();
  });

  it('queues every batch on the ordered writer, encoded, in the order given', () => {
    const queued: ArchiveBatch[] = [];
    const sink = archiveSink({ enqueue: (b: ArchiveBatch) => void queued.push(b) } as unknown as ArchiveWriter);
    sink.enqueue(batch(0, 3));
    sink.enqueue(batch(3, 2));
    expect(queued.map((b) => [b.block!.firstSeq, b.block!.count])).toEqual([[0, 3], [3, 2]]);
  });
});
