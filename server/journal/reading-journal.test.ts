import { appendFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../shared/schemas/reading.js';
import { ReadingJournal } from './reading-journal.js';

const reading = (t: number): Reading => ({
  t, volts: 13 - t / 1000, amps: 10, temps: { cell: 25 }, clock: 'device', elapsedSeconds: t, watts: 130, dischargeWh: 0, dischargeAh: 0, chargeWh: 0, chargeAh: 0,
});
const fresh = (over: Partial<ConstructorParameters<typeof ReadingJournal>[0]> = {}) => {
  const dir = mkdtempSync(join(tmpdir(), 'kp-journal-'));
  const logs: string[] = [];
  const make = () => new ReadingJournal({ dir, log: { info: (m) => logs.push(m), warn: (m) => logs.push(m), error: (m) => logs.push(m) }, nowMs: () => 1_700_000_000_000, ...over });
  return { dir, logs, make };
};
const files = (dir: string) => readdirSync(dir).sort();

describe('ReadingJournal', () => {
  it('gives back every reading written before a restart, in order, with its index and frame', async () => {
    const { make } = fresh();
    const a = make();
    for (let i = 0; i < 25; i++) a.append(7, i, reading(i));
    await a.flush();
    // No close(): a killed process never gets to it.
    const recovered = await make().recover();
    expect(recovered).toHaveLength(1);
    expect(recovered[0]!.runId).toBe(7);
    expect(recovered[0]!.records.map((r) => r.i)).toEqual([...Array(25).keys()]);
    expect(recovered[0]!.records[3]!.f).toEqual({ t: 3, volts: 13 - 3 / 1000, amps: 10, temps: { cell: 25 }, clock: 'device' });
    expect(recovered[0]!.records[3]!.a).toBe(1_700_000_000);
  });

  it('writes and syncs every reading on a batch timer of at most 50 ms, without being asked', async () => {
    let tick: (() => void) | null = null;
    let everyMs = Infinity;
    const { dir, make } = fresh({ setInterval: (fn, ms) => ((tick = fn), (everyMs = ms), {}), clearInterval: () => undefined });
    const j = make();
    j.start();
    // Half the 100 ms promise, leaving the other half for the write and fdatasync (p95 12 ms here, docs/reliability.md).
    expect(everyMs).toBeLessThanOrEqual(50);
    j.append(1, 0, reading(0));
    tick!();
    await j.flush();
    const segment = join(dir, 'run-1', files(join(dir, 'run-1'))[0]!);
    expect(readFileSync(segment, 'utf8').split('\n').filter(Boolean)).toHaveLength(1);
    await j.close();
  });

  it('writes what arrived in one turn of the event loop right after it, before any sync', async () => {
    const immediate: (() => void)[] = [];
    let synced = 0;
    const { dir, make } = fresh({ setInterval: () => ({}), clearInterval: () => undefined, setImmediate: (fn) => void immediate.push(fn) });
    const j = make();
    j.start();
    for (let i = 0; i < 3; i++) j.append(1, i, reading(i));
    expect(immediate).toHaveLength(1); // one write for the whole turn
    immediate.shift()!();
    await j.settled();
    synced = j.getStats().syncs;
    const segment = join(dir, 'run-1', files(join(dir, 'run-1'))[0]!);
    expect(readFileSync(segment, 'utf8').split('\n').filter(Boolean)).toHaveLength(3);
    expect(synced).toBe(0);
    await j.close();
    expect(j.getStats().syncs).toBe(1);
  });

  it('cuts off a torn last record (a crash mid-write) with a log line and keeps the rest', async () => {
    const { dir, logs, make } = fresh();
    const a = make();
    for (let i = 0; i < 5; i++) a.append(2, i, reading(i));
    await a.flush();
    const segment = join(dir, 'run-2', files(join(dir, 'run-2'))[0]!);
    const good = readFileSync(segment).length;
    appendFileSync(segment, '1a2b3c4d {"i":5,"a":1,"f":{"t":5,"vol');
    const [run] = await make().recover();
    expect(run!.records.map((r) => r.i)).toEqual([0, 1, 2, 3, 4]);
    expect(logs.join('\n')).toMatch(/run 2 .*torn record at byte \d+.*cut off after 5 good readings/);
    expect(readFileSync(segment).length).toBe(good);
  });

  it('never fails on a corrupt journal: a bad record ends what is trusted, garbage files and folders are passed over', async () => {
    const { dir, logs, make } = fresh();
    const a = make();
    for (let i = 0; i < 4; i++) a.append(3, i, reading(i));
    await a.flush();
    const segment = join(dir, 'run-3', files(join(dir, 'run-3'))[0]!);
    const lines = readFileSync(segment, 'utf8').split('\n');
    lines[2] = lines[2]!.replace('"amps":10', '"amps":99'); // a flipped byte: the CRC no longer matches
    writeFileSync(segment, lines.join('\n'));
    mkdirSync(join(dir, 'run-4'));
    writeFileSync(join(dir, 'run-4', '000000000000.jnl'), Buffer.from([0, 255, 10, 1, 2, 3]));
    mkdirSync(join(dir, 'not-a-run'));
    const recovered = await make().recover();
    expect(recovered.find((r) => r.runId === 3)!.records.map((r) => r.i)).toEqual([0, 1]);
    expect(recovered.find((r) => r.runId === 4)!.records).toEqual([]);
    expect(logs.join('\n')).toMatch(/corrupt record/);
  });

  it('deletes segments the archive holds, and the run\'s folder once its final batch is in', async () => {
    const { dir, make } = fresh({ segmentReadings: 10 });
    const j = make();
    for (let i = 0; i < 35; i++) j.append(5, i, reading(i));
    await j.flush();
    for (let i = 35; i < 40; i++) j.append(5, i, reading(i));
    await j.flush();
    // 10 readings a segment, flushed in two writes: segments start at 0 and 35.
    expect(files(join(dir, 'run-5'))).toEqual(['000000000000.jnl', '000000000035.jnl']);
    j.archived(5, 35);
    await j.flush();
    expect(files(join(dir, 'run-5'))).toEqual(['000000000035.jnl']);
    j.archived(5, 40, true);
    await j.flush();
    expect(existsSync(join(dir, 'run-5'))).toBe(false);
    expect(j.getStats().bytes).toBe(0);
  });

  it('skips readings it already holds (a replay), and stays within its size bound', async () => {
    const { logs, make } = fresh({ maxBytes: 2000 });
    const a = make();
    for (let i = 0; i < 3; i++) a.append(6, i, reading(i));
    await a.flush();
    const b = make();
    await b.recover();
    for (let i = 0; i < 30; i++) b.append(6, i, reading(i));
    await b.flush();
    const stats = b.getStats();
    expect(stats.bytes).toBeLessThanOrEqual(2000);
    expect(stats.dropped).toBeGreaterThan(0);
    expect(logs.filter((l) => l.includes('journal: full'))).toHaveLength(1);
    const indexes = (await make().recover())[0]!.records.map((r) => r.i);
    expect(indexes.slice(0, 4)).toEqual([0, 1, 2, 3]);
    expect(new Set(indexes).size).toBe(indexes.length);
  });
});
