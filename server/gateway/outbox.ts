import { closeSync, existsSync, fsyncSync, openSync, readFileSync, writeSync, ftruncateSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { FeedMessageSchema, type FeedMessage } from '../../shared/schemas/gateway.js';
import { quietLogger, type Logger } from '../log/logger.js';

/** The log is compacted (emptied) once everything in it is acknowledged and it is larger than this. */
export const COMPACT_AT_BYTES = 8 * 1024 * 1024;
/**
 * fsync policy: lines are written to the file as soon as they are made (a killed gateway
 * process loses none: the kernel holds them), and the file is fsynced at most this long
 * after a write, so a power cut loses at most this much of the newest readings.
 */
export const FSYNC_INTERVAL_MS = 1000;
/** The acknowledged offset is saved at most this often (a restart re-sends at most this much; the server drops the repeats by seq). */
export const ACK_SAVE_INTERVAL_MS = 200;

/** One message kept until the broker acknowledges it. */
export interface OutboxEntry {
  benchId: number;
  message: FeedMessage;
  /** Byte offset just past its line. */
  endOffset: number;
  acked?: boolean;
}

type Draft = { type: 'frame'; atMs: number; frame: Extract<FeedMessage, { type: 'frame' }>['frame'] } | { type: 'status'; atMs: number; status: Extract<FeedMessage, { type: 'status' }>['status'] };

/**
 * The gateway's on-disk outbox: an append-only log of feed messages (`<benchId> <json>` lines)
 * and the byte offset up to which the broker has acknowledged them. Everything past that
 * offset is sent again, in order and with its original time stamps, after an outage or a
 * restart. Each bench's sequence numbers continue across restarts and compactions.
 */
export class Outbox {
  private readonly logPath: string;
  private readonly ackPath: string;
  private readonly seqPath: string;
  private fd: number;
  private sizeBytes: number;
  private ackedBytes: number;
  private savedAckBytes: number;
  private readonly lastSeq = new Map<number, number>();
  private readonly pending: OutboxEntry[] = [];
  private head = 0;
  /** Absolute index (since this outbox was opened) of pending[0]. */
  private base = 0;
  private dirty = false;
  private syncTimer: NodeJS.Timeout | undefined;
  private ackTimer: NodeJS.Timeout | undefined;

  constructor(dir: string, private readonly log: Logger = quietLogger) {
    this.logPath = join(dir, 'outbox.log');
    this.ackPath = join(dir, 'outbox.acked');
    this.seqPath = join(dir, 'outbox.seq');
    if (existsSync(this.seqPath)) for (const [id, seq] of Object.entries(JSON.parse(readFileSync(this.seqPath, 'utf8')) as Record<string, number>)) this.lastSeq.set(Number(id), seq);
    const text = existsSync(this.logPath) ? readFileSync(this.logPath) : Buffer.alloc(0);
    this.ackedBytes = existsSync(this.ackPath) ? Math.min(Number(readFileSync(this.ackPath, 'utf8')) || 0, text.length) : 0;
    this.savedAckBytes = this.ackedBytes;
    this.sizeBytes = this.loadLines(text);
    this.fd = openSync(this.logPath, 'a');
    if (this.sizeBytes < text.length) ftruncateSync(this.fd, this.sizeBytes); // a torn last line from a power cut
  }

  /** Reads the log: every bench's last seq, and the unacknowledged entries. Returns the length of the whole lines. */
  private loadLines(text: Buffer): number {
    let start = 0;
    for (;;) {
      const end = text.indexOf(0x0a, start);
      if (end < 0) return start;
      const line = text.subarray(start, end).toString('utf8');
      const space = line.indexOf(' ');
      try {
        const benchId = Number(line.slice(0, space));
        const message = FeedMessageSchema.parse(JSON.parse(line.slice(space + 1)));
        this.lastSeq.set(benchId, Math.max(this.lastSeq.get(benchId) ?? 0, message.seq));
        if (end + 1 > this.ackedBytes) this.pending.push({ benchId, message, endOffset: end + 1 });
      } catch (err) {
        this.log.warn(`outbox: an unreadable line at byte ${start} was skipped`, err);
      }
      start = end + 1;
    }
  }

  /** Adds a message for a bench with the bench's next sequence number; written to the file at once. */
  append(benchId: number, draft: Draft): OutboxEntry {
    const seq = (this.lastSeq.get(benchId) ?? 0) + 1;
    this.lastSeq.set(benchId, seq);
    const message = { ...draft, seq } as FeedMessage;
    const line = Buffer.from(`${benchId} ${JSON.stringify(message)}\n`);
    writeSync(this.fd, line);
    this.sizeBytes += line.length;
    const entry = { benchId, message, endOffset: this.sizeBytes };
    this.pending.push(entry);
    this.dirty = true;
    this.syncTimer ??= setTimeout(() => this.sync(), FSYNC_INTERVAL_MS);
    return entry;
  }

  /** Entries not yet acknowledged, oldest first. */
  unacknowledged(): readonly OutboxEntry[] {
    return this.pending.slice(this.head);
  }

  /** The entry at an absolute index (0 = the first kept or appended since opening); undefined once acknowledged and dropped, or not yet made. */
  at(index: number): OutboxEntry | undefined {
    return index >= this.base + this.head ? this.pending[index - this.base] : undefined;
  }

  /** Absolute index of the oldest unacknowledged entry. */
  get firstUnacknowledged(): number {
    return this.base + this.head;
  }

  /** How many messages wait for the broker's acknowledgement. */
  get depth(): number {
    return this.pending.length - this.head;
  }

  /** The broker acknowledged an entry; the saved offset moves past every acknowledged entry at the front. */
  acknowledge(entry: OutboxEntry): void {
    entry.acked = true;
    for (let front = this.pending[this.head]; front?.acked; front = this.pending[this.head]) {
      this.head++;
      this.ackedBytes = front.endOffset;
    }
    if (this.head > 4096 && this.head * 2 > this.pending.length) {
      this.pending.splice(0, this.head);
      this.base += this.head;
      this.head = 0;
    }
    this.ackTimer ??= setTimeout(() => this.saveAck(), ACK_SAVE_INTERVAL_MS);
  }

  private saveAck(): void {
    this.ackTimer = undefined;
    if (this.ackedBytes === this.savedAckBytes) return;
    if (this.depth === 0 && this.sizeBytes > COMPACT_AT_BYTES) return this.compact();
    writeFileSync(`${this.ackPath}.tmp`, String(this.ackedBytes));
    renameSync(`${this.ackPath}.tmp`, this.ackPath);
    this.savedAckBytes = this.ackedBytes;
  }

  /** Empties a fully acknowledged log, keeping each bench's last seq aside first. */
  private compact(): void {
    writeFileSync(`${this.seqPath}.tmp`, JSON.stringify(Object.fromEntries(this.lastSeq)));
    renameSync(`${this.seqPath}.tmp`, this.seqPath);
    ftruncateSync(this.fd, 0);
    this.sizeBytes = 0;
    this.ackedBytes = 0;
    this.base += this.pending.length;
    this.pending.length = 0;
    this.head = 0;
    writeFileSync(`${this.ackPath}.tmp`, '0');
    renameSync(`${this.ackPath}.tmp`, this.ackPath);
    this.savedAckBytes = 0;
  }

  /** fsyncs what was written since the last sync. */
  sync(): void {
    this.syncTimer = undefined;
    if (!this.dirty) return;
    this.dirty = false;
    fsyncSync(this.fd);
  }

  /** Syncs, saves the acknowledged offset and closes the file. */
  close(): void {
    clearTimeout(this.syncTimer);
    clearTimeout(this.ackTimer);
    this.ackTimer = undefined;
    this.sync();
    this.saveAck();
    closeSync(this.fd);
  }
}
