import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { ArchiveBatch } from './archive-batch.js';
import { ArchiveWriter } from './archive-writer.js';
import { SpillStore } from './spill-store.js';

const dirs: string[] = [];
afterEach(async () => {
  await Promise.all(dirs.splice(0).map((d) => rm(d, { recursive: true, force: true })));
});
async function tempDir(): Promise<string> {
  const d = await mkdtemp(join(tmpdir(), 'kp-spill-'));
  dirs.push(d);
  return d;
}

const batch = (runId: number, firstSeq: number): ArchiveBatch => ({
  runId,
  block: {
    firstSeq, count: 1, firstElapsedSeconds: firstSeq, lastElapsedSeconds: firstSeq, layout: { endian: 'le', count: 1, columns: [] }, data: Buffer.alloc(4000, firstSeq % 256),
    statsLayout: { endian: 'le', count: 1, columns: [] }, stats: Buffer.alloc(8, 1),
  },
  events: [],
  patch: { readingsCount: firstSeq + 1, startedAt: new Date(0) },
});

describe('ArchiveWriter', () => {
  it('buffers while the database is down, spills past the memory bound, and writes everything in order once it returns', async () => {
    const dir = await tempDir();
    let up = false;
    const written: number[] = [];
    const writer = new ArchiveWriter({
      spill: new SpillStore(dir),
      memoryLimitBytes: 20_000, // about four batches
      sleep: () => new Promise((r) => setImmediate(r)),
      write: async (b) => {
        if (!up) throw new Error('ECONNREFUSED');
        written.push(b.block!.firstSeq);
      },
    });
    await writer.start();
    for (let i = 0; i < 20; i++) writer.enqueue(batch(1, i));
    // Spilling is disk I/O: wait until every batch is accounted for (a fixed 50 ms flaked on a busy machine).
    const deadline = Date.now() + 5000;
    while (writer.getStats().spilled + writer.getStats().inMemory < 20 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 10));
    const stats = writer.getStats();
    expect(stats.healthy).toBe(false);
    expect(stats.inMemory).toBeLessThanOrEqual(4);
    expect(stats.spilled + stats.inMemory).toBe(20);
    expect((await readdir(dir)).length).toBeGreaterThan(0);
    up = true;
    await writer.flush();
    expect(written).toEqual(Array.from({ length: 20 }, (_, i) => i));
    expect(await readdir(dir)).toEqual([]);
  });

  it('replays batches a previous process spilled, Buffers and dates intact', async () => {
    const dir = await tempDir();
    const first = new SpillStore(dir);
    await first.push(batch(7, 3));
    await first.push(batch(7, 4));
    const seen: ArchiveBatch[] = [];
    const writer = new ArchiveWriter({ spill: new SpillStore(dir), write: async (b) => void seen.push(b) });
    await writer.start();
    await writer.flush();
    expect(seen.map((b) => b.block!.firstSeq)).toEqual([3, 4]);
    expect(seen[0]!.block!.data.equals(Buffer.alloc(4000, 3))).toBe(true);
    expect(seen[0]!.patch.startedAt).toEqual(new Date(0));
  });
});

describe('ArchiveWriter.shutdown', () => {
  it('hands unwritten batches to the spill, in front of newer ones, when the database stays away', async () => {
    const dir = await tempDir();
    const writer = new ArchiveWriter({
      spill: new SpillStore(dir),
      memoryLimitBytes: 12_000, // two batches in memory, the rest spilled
      sleep: () => new Promise((r) => setTimeout(r, 5)),
      write: async () => {
        throw new Error('ECONNREFUSED');
      },
    });
    await writer.start();
    for (let i = 0; i < 5; i++) writer.enqueue(batch(2, i));
    await writer.shutdown(30);
    const seen: number[] = [];
    const next = new ArchiveWriter({ spill: new SpillStore(dir), write: async (b) => void seen.push(b.block!.firstSeq) });
    await next.start();
    await next.flush();
    expect(seen).toEqual([0, 1, 2, 3, 4]);
  });
});

describe('ArchiveWriter with a permanent error', () => {
  it('sets the batch aside after a few attempts and goes on with the next', async () => {
    const dir = await tempDir();
    const aside: number[] = [];
    const written: number[] = [];
    const writer = new ArchiveWriter({
      spill: new SpillStore(dir),
      sleep: async () => undefined,
      isTransient: (err) => !String(err).includes('no such run'),
      deadLetter: async (b) => void aside.push(b.block!.firstSeq),
      write: async (b) => {
        if (b.runId === 404) throw new Error('no such run');
        written.push(b.block!.firstSeq);
      },
    });
    writer.enqueue(batch(404, 1));
    writer.enqueue(batch(1, 2));
    await writer.flush();
    expect(aside).toEqual([1]);
    expect(written).toEqual([2]);
  });
});
