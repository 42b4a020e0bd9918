import { mkdtempSync, readFileSync, appendFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { COMPACT_AT_BYTES, Outbox } from './outbox.js';
import { quietLogger } from '../log/logger.js';

const dirs: string[] = [];
const fresh = () => {
  const dir = mkdtempSync(join(tmpdir(), 'kp-outbox-'));
  dirs.push(dir);
  return dir;
};
afterEach(() => void dirs.splice(0));

const frame = (t: number) => ({ type: 'frame' as const, atMs: 1_000 + t, frame: { t, volts: 13.1, amps: 5, clock: 'device' as const } });

describe('gateway outbox', () => {
  it('numbers messages per bench and keeps what the broker did not acknowledge across a restart, in order with original times', () => {
    const dir = fresh();
    const first = new Outbox(dir);
    const entries = [first.append(1, frame(0)), first.append(2, frame(0)), first.append(1, frame(1)), first.append(1, frame(2))];
    expect(entries.map((e) => [e.benchId, e.message.seq])).toEqual([[1, 1], [2, 1], [1, 2], [1, 3]]);
    first.acknowledge(entries[0]!);
    first.acknowledge(entries[2]!); // out of order: the saved point stays before the unacknowledged entry 1
    expect(first.depth).toBe(3);
    first.close();

    const second = new Outbox(dir);
    expect(second.unacknowledged().map((e) => [e.benchId, e.message.seq])).toEqual([[2, 1], [1, 2], [1, 3]]);
    expect(second.unacknowledged().map((e) => e.message.atMs)).toEqual([1_000, 1_001, 1_002]);
    // Numbering carries on after a restart.
    expect(second.append(1, frame(3)).message.seq).toBe(4);
    expect(second.append(2, frame(1)).message.seq).toBe(2);
    second.close();
  });

  it('drops a torn last line (a power cut mid-write) and carries on after it', () => {
    const dir = fresh();
    const box = new Outbox(dir);
    box.append(1, frame(0));
    box.close();
    appendFileSync(join(dir, 'outbox.log'), '1 {"type":"frame","seq":2,"atMs":1');
    const again = new Outbox(dir);
    expect(again.unacknowledged()).toHaveLength(1);
    expect(again.append(1, frame(1)).message.seq).toBe(2);
    again.close();
    const lines = readFileSync(join(dir, 'outbox.log'), 'utf8').trim().split('\n');
    expect(lines).toHaveLength(2);
    expect(lines.map((l) => JSON.parse(l.slice(2)).seq)).toEqual([1, 2]);
  });

  it('skips an unreadable whole line, keeps the lines after it, and tells its logger why (the error object)', () => {
    const dir = fresh();
    const box = new Outbox(dir);
    box.append(1, frame(0));
    box.close();
    appendFileSync(join(dir, 'outbox.log'), '1 {"type":"frame","seq":2,"atMs":"not a time"}\n');
    const later = new Outbox(dir);
    later.append(1, frame(2));
    later.close();
    const warned: [string, unknown][] = [];
    const again = new Outbox(dir, { ...quietLogger, warn: (message, error) => void warned.push([message, error]) });
    expect(again.unacknowledged().map((e) => e.message.seq)).toEqual([1, 2]);
    again.close();
    expect(warned).toHaveLength(1);
    expect(warned[0]![0]).toMatch(/unreadable line at byte \d+ was skipped/);
    expect(warned[0]![1]).toBeInstanceOf(Error);
  });

  it('empties a fully acknowledged log past its size limit and keeps counting', () => {
    const dir = fresh();
    const box = new Outbox(dir);
    const padding = { type: 'status' as const, atMs: 0, status: { state: 'receiving' as const, message: 'x'.repeat(10_000), framesOk: 0, framesRejected: 0 } };
    const count = Math.ceil(COMPACT_AT_BYTES / 10_000) + 1;
    for (let i = 0; i < count; i++) box.acknowledge(box.append(7, padding));
    box.close();
    expect(readFileSync(join(dir, 'outbox.log')).length).toBe(0);
    const again = new Outbox(dir);
    expect(again.depth).toBe(0);
    expect(again.append(7, frame(0)).message.seq).toBe(count + 1);
    again.close();
  });
});
