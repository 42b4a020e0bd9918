import { mkdir, readdir, readFile, rename, unlink, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { eventWithCurrentKeys, summaryWithCurrentKeys } from '../../shared/schemas/legacy-keys.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import type { RunSummary } from '../../shared/schemas/run-summary.js';
import type { ArchiveBatch } from './archive-batch.js';

const SPILL_SUFFIX = '.batch.json';
/** File names sort in write order: a zero-padded counter, wide enough for years of batches. */
const SEQ_DIGITS = 12;
/** Counters start mid-range so batches can also be put in front (shutdown hands back older work). */
const FIRST_SEQ = 100_000_000_000;

interface SpilledBatch extends Omit<ArchiveBatch, 'block' | 'patch'> {
  block: (Omit<NonNullable<ArchiveBatch['block']>, 'data' | 'stats'> & { data: string; stats: string }) | null;
  patch: Omit<ArchiveBatch['patch'], 'startedAt' | 'endedAt'> & { startedAt?: string; endedAt?: string };
}

/**
 * Batches that did not fit in memory while the database was away, one file each under
 * the spill folder (.data/spill/ by default), read back oldest first. A file is written
 * under a temporary name and renamed, so a crash never leaves half a batch to replay.
 */
export class SpillStore {
  private nextSeq = 0;
  private files: string[] = [];
  private ready: Promise<void> | null = null;

  constructor(private readonly dir: string) {}

  /** Lists what an earlier process left behind; call before anything else. */
  init(): Promise<void> {
    this.ready ??= (async () => {
      await mkdir(this.dir, { recursive: true });
      this.files = (await readdir(this.dir)).filter((f) => f.endsWith(SPILL_SUFFIX)).sort();
      const last = this.files[this.files.length - 1];
      this.nextSeq = last ? Number.parseInt(last, 10) + 1 : FIRST_SEQ;
    })();
    return this.ready;
  }

  get size(): number {
    return this.files.length;
  }

  /** Appends one batch at the end of the spill. */
  async push(batch: ArchiveBatch): Promise<void> {
    await this.init();
    await this.write(this.nextSeq++, batch);
    this.files.push(this.nameOf(this.nextSeq - 1));
  }

  /** Puts batches, in their order, before everything already spilled (they are older). */
  async pushFront(batches: readonly ArchiveBatch[]): Promise<void> {
    await this.init();
    const first = this.files[0] ? Number.parseInt(this.files[0], 10) : this.nextSeq;
    const start = first - batches.length;
    for (let i = 0; i < batches.length; i++) await this.write(start + i, batches[i]!);
    this.files.unshift(...batches.map((_, i) => this.nameOf(start + i)));
  }

  private nameOf(seq: number): string {
    return String(seq).padStart(SEQ_DIGITS, '0') + SPILL_SUFFIX;
  }

  private async write(seq: number, batch: ArchiveBatch): Promise<void> {
    const name = this.nameOf(seq);
    const spilled: SpilledBatch = {
      ...batch,
      block: batch.block ? { ...batch.block, data: batch.block.data.toString('base64'), stats: batch.block.stats.toString('base64') } : null,
      patch: {
        ...batch.patch,
        startedAt: batch.patch.startedAt?.toISOString(),
        endedAt: batch.patch.endedAt?.toISOString(),
      },
    };
    const tmp = join(this.dir, name + '.tmp');
    await writeFile(tmp, JSON.stringify(spilled));
    await rename(tmp, join(this.dir, name));
  }

  /** The oldest spilled batch, or null when the spill is empty. */
  async peek(): Promise<ArchiveBatch | null> {
    await this.init();
    const name = this.files[0];
    if (!name) return null;
    const s = JSON.parse(await readFile(join(this.dir, name), 'utf8')) as SpilledBatch;
    return {
      ...s,
      block: s.block ? { ...s.block, data: Buffer.from(s.block.data, 'base64'), stats: Buffer.from(s.block.stats, 'base64') } : null,
      // A batch spilled by a server from before the run-time rename says `t`, `endT`, ...: read them as the current names.
      events: s.events.map(({ eventSeq, event }) => ({ eventSeq, event: eventWithCurrentKeys(event) as RunEvent })),
      patch: {
        ...s.patch,
        ...(s.patch.summary ? { summary: summaryWithCurrentKeys(s.patch.summary) as RunSummary } : {}),
        startedAt: s.patch.startedAt ? new Date(s.patch.startedAt) : undefined,
        endedAt: s.patch.endedAt ? new Date(s.patch.endedAt) : undefined,
      },
    };
  }

  /** Removes the oldest batch once it is safely in the database. */
  async shift(): Promise<void> {
    const name = this.files.shift();
    if (name) await unlink(join(this.dir, name));
  }
}
