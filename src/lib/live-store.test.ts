import { describe, expect, it } from 'vitest';
import type { ReadingColumns, ServerMessage } from '../../shared/schemas/ws';
import { LIVE_COLUMN, LiveStore } from './live-store';

const topic = { kind: 'run', id: 1 } as const;

/** A run topic's columns: its time column is run time (`elapsedSeconds`). */
function cols(elapsedSeconds: number[]): ReadingColumns {
  return { elapsedSeconds, volts: elapsedSeconds.map(() => 12.8), amps: elapsedSeconds.map(() => 5), watts: elapsedSeconds.map(() => 64), temps: {} };
}
const batch = (t: number[]): ServerMessage => ({ type: 'batch', seq: 0, topic, readings: cols(t), dropped: 0 });

function manualFrames() {
  const queue: (() => void)[] = [];
  return { schedule: (fn: () => void) => void queue.push(fn), flush: () => queue.splice(0).forEach((fn) => fn()), queue };
}

describe('LiveStore', () => {
  it('tells its listeners at most once per animation frame, however many batches arrive', () => {
    const frames = manualFrames();
    const store = new LiveStore(frames.schedule);
    let notified = 0;
    store.subscribe(() => notified++);
    store.handle(batch([0, 0.1]));
    store.handle(batch([0.2, 0.3]));
    store.handle(batch([0.4]));
    expect(frames.queue).toHaveLength(1);
    expect(notified).toBe(0);
    frames.flush();
    expect(notified).toBe(1);
    expect(store.getSnapshot().time).toBe(0.4);
    expect(store.buffer.length).toBe(5);
  });

  it('draws a gap (null row) across an outage instead of a straight line', () => {
    const store = new LiveStore((fn) => fn());
    store.handle(batch([0, 1, 2]));
    store.handle(batch([60, 61]));
    const volts = Array.from({ length: store.buffer.length }, (_, i) => store.buffer.at(LIVE_COLUMN.volts, i));
    expect(volts).toEqual([12.8, 12.8, 12.8, null, 12.8, 12.8]);
  });

  it('keeps only new readings when a snapshot after a reconnect repeats old ones', () => {
    const store = new LiveStore((fn) => fn());
    store.handle(batch([0, 1, 2]));
    store.handle({ type: 'snapshot', stream: 's1', seq: 9, resume: 'fresh', topic, status: null, run: null, recent: cols([1, 2, 3]), events: [] });
    const t = Array.from({ length: store.buffer.length }, (_, i) => store.buffer.at(LIVE_COLUMN.time, i));
    expect(t).toEqual([0, 1, 2, 3]);
  });

  it("takes a bench topic's source time column `t` as its time", () => {
    const store = new LiveStore((fn) => fn());
    const bench = { kind: 'bench', id: 2 } as const;
    store.handle({ type: 'batch', seq: 2, topic: bench, readings: { t: [1_700_000_000, 1_700_000_001], volts: [12.8, 12.7], amps: [5, 5], watts: [64, 63.5], temps: {} }, dropped: 0 });
    expect(store.getSnapshot().time).toBe(1_700_000_001);
    expect(store.buffer.at(LIVE_COLUMN.time, 0)).toBe(1_700_000_000);
  });

  it('appends events and reports them as live, snapshot events as replayed', () => {
    const store = new LiveStore((fn) => fn());
    const heard: [string, boolean][] = [];
    store.onEvent((e, live) => heard.push([e.type, live]));
    store.handle({ type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status: null, run: null, recent: cols([]), events: [{ type: 'run-start', elapsedSeconds: 0 }] });
    store.handle({ type: 'event', topic, eventId: 5, event: { type: 'annotation', elapsedSeconds: 3, text: 'Fan on' } });
    expect(heard).toEqual([
      ['run-start', false],
      ['annotation', true],
    ]);
    expect(store.getSnapshot().events.map((e) => e.type)).toEqual(['run-start', 'annotation']);
  });
});

describe('LiveStore.backfill', () => {
  const history = {
    x: [0, 10, 20, 30],
    bucketSeconds: 10,
    volts: { min: [13.1, 13.0, 12.9, 12.8], max: [13.2, 13.1, 13.0, 12.9] },
    amps: { min: [5, 5, 5, 5], max: [5, 5, 5, 5] },
    watts: { min: [65, 65, 65, 65], max: [66, 66, 66, 66] },
    temps: {},
  };

  it('puts archived min/max rows before the live rows and keeps the live rows intact', () => {
    const store = new LiveStore((fn) => fn());
    store.handle(batch([30, 31, 32]));
    store.backfill(history);
    const t = Array.from({ length: store.buffer.length }, (_, i) => store.buffer.at(LIVE_COLUMN.time, i));
    // Buckets at 0, 10, 20 give a min row and a max row half a bucket later; the bucket at 30 overlaps the live rows.
    expect(t).toEqual([0, 5, 10, 15, 20, 25, 30, 31, 32]);
    const volts = Array.from({ length: 6 }, (_, i) => store.buffer.at(LIVE_COLUMN.volts, i));
    expect(volts).toEqual([13.1, 13.2, 13.0, 13.1, 12.9, 13.0]);
  });

  it('leaves a gap when the archive ends well before the live rows begin', () => {
    const store = new LiveStore((fn) => fn());
    store.handle(batch([300, 301]));
    store.backfill(history);
    const volts = Array.from({ length: store.buffer.length }, (_, i) => store.buffer.at(LIVE_COLUMN.volts, i));
    expect(volts.slice(-3)).toEqual([null, 12.8, 12.8]);
  });
});

describe('LiveStore notes', () => {
  it('replaces an edited note and takes out a removed one, telling note listeners', () => {
    const store = new LiveStore((fn) => fn());
    const heard: number[] = [];
    store.onNoteChange((id) => heard.push(id));
    const note = { type: 'annotation' as const, elapsedSeconds: 3, text: 'Fan on', author: 'Tomas' };
    store.handle({ type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status: null, run: null, recent: cols([]), events: [{ type: 'run-start', elapsedSeconds: 0 }, note] });
    const edited = { ...note, text: 'Fan on, 30 cm away' };
    store.handle({ type: 'note', topic, eventId: 8, previous: note, event: edited });
    expect(store.getSnapshot().events).toEqual([{ type: 'run-start', elapsedSeconds: 0 }, edited]);
    store.handle({ type: 'note', topic, eventId: 8, previous: edited, event: null });
    expect(store.getSnapshot().events).toEqual([{ type: 'run-start', elapsedSeconds: 0 }]);
    expect(heard).toEqual([8, 8]);
  });
});
