import { describe, expect, it } from 'vitest';
import type { ReadingColumns, ServerMessage } from '../../shared/schemas/ws';
import { LIVE_COLUMN, LiveStore } from './live-store';

const topic = { kind: 'run', id: 1 } as const;

function cols(t: number[]): ReadingColumns {
  return { t, volts: t.map(() => 12.8), amps: t.map(() => 5), watts: t.map(() => 64), temps: {} };
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
    expect(store.getSnapshot().t).toBe(0.4);
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
    store.handle({ type: 'snapshot', seq: 9, topic, status: null, run: null, recent: cols([1, 2, 3]), events: [] });
    const t = Array.from({ length: store.buffer.length }, (_, i) => store.buffer.at(LIVE_COLUMN.t, i));
    expect(t).toEqual([0, 1, 2, 3]);
  });

  it('appends events and reports them as live, snapshot events as replayed', () => {
    const store = new LiveStore((fn) => fn());
    const heard: [string, boolean][] = [];
    store.onEvent((e, live) => heard.push([e.type, live]));
    store.handle({ type: 'snapshot', seq: 1, topic, status: null, run: null, recent: cols([]), events: [{ type: 'run-start', t: 0 }] });
    store.handle({ type: 'event', seq: 2, topic, eventId: 5, event: { type: 'annotation', t: 3, text: 'Fan on' } });
    expect(heard).toEqual([
      ['run-start', false],
      ['annotation', true],
    ]);
    expect(store.getSnapshot().events.map((e) => e.type)).toEqual(['run-start', 'annotation']);
  });
});
