import type { AnnotationEvent, RunEvent } from '../../shared/schemas/run-event';
import { timeColumn, type ReadingColumns, type ServerMessage } from '../../shared/schemas/ws';
import { ColumnarRingBuffer } from './ring-buffer';
import { EMPTY_LIVE_VIEW, pickTempChannel, type HistoryColumns, type LiveView, type MinMax } from './live-view';

export type { HistoryColumns, LiveView } from './live-view';

/** Column order in the ring buffer (and in the chart's data); `time` is run time on a run topic, source time on a bench topic. */
export const LIVE_COLUMN = { time: 0, volts: 1, amps: 2, watts: 3, temp: 4 } as const;
const COLUMN_COUNT = 5;
/** 15 minutes at 10 Hz; older readings live in the archive, not in the browser. */
export const LIVE_WINDOW_ROWS = 9_000;
/** A pause longer than this, and longer than GAP_FACTOR sample periods, is drawn as a gap. */
const MIN_GAP_SECONDS = 3;
const GAP_FACTOR = 5;

/** The timeline with one note replaced by its new text, or taken out (`next` null). */
function withNoteChange(events: readonly RunEvent[], previous: AnnotationEvent, next: AnnotationEvent | null): readonly RunEvent[] {
  const i = events.findIndex((e) => e.type === 'annotation' && e.elapsedSeconds === previous.elapsedSeconds && e.text === previous.text && e.author === previous.author);
  if (i < 0) return events;
  return next ? [...events.slice(0, i), next, ...events.slice(i + 1)] : [...events.slice(0, i), ...events.slice(i + 1)];
}

export type FrameScheduler = (fn: () => void) => void;
export type EventListener = (event: RunEvent, live: boolean) => void;

const defaultScheduler: FrameScheduler = (fn) =>
  typeof requestAnimationFrame === 'function' ? requestAnimationFrame(() => fn()) : setTimeout(fn, 16);

/**
 * Live state of one topic, kept outside React. Readings go into a preallocated ring buffer;
 * listeners (React and the chart) are told at most once per animation frame.
 */
export class LiveStore {
  readonly buffer = new ColumnarRingBuffer(COLUMN_COUNT, LIVE_WINDOW_ROWS);
  private view: LiveView = EMPTY_LIVE_VIEW;
  private next: LiveView = EMPTY_LIVE_VIEW;
  private scheduled = false;
  private lastDtSeconds = 0;
  private readonly listeners = new Set<() => void>();
  private readonly eventListeners = new Set<EventListener>();
  private readonly snapshotListeners = new Set<(firstT: number | null) => void>();
  private readonly noteListeners = new Set<(eventId: number) => void>();
  private readonly row: (number | null)[] = new Array(COLUMN_COUNT).fill(null);

  constructor(
    private readonly schedule: FrameScheduler = defaultScheduler,
    private readonly nowMs: () => number = Date.now,
  ) {}

  /** For useSyncExternalStore. */
  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  /** For useSyncExternalStore: the same object until something changes. */
  getSnapshot = (): LiveView => this.view;

  /** Hears every event; `live` is false for events replayed from a snapshot. */
  onEvent(listener: EventListener): () => void {
    this.eventListeners.add(listener);
    return () => this.eventListeners.delete(listener);
  }

  /** Hears each edit or removal of a note on this run, with the note's stored id. */
  onNoteChange(listener: (eventId: number) => void): () => void {
    this.noteListeners.add(listener);
    return () => this.noteListeners.delete(listener);
  }

  /**
   * Hears each snapshot that leaves the history to fetch (first subscribe, or a reconnect whose
   * cursor the server no longer had) with the first reading time it holds. A resumed snapshot
   * carries exactly the readings missed, so nothing is fetched for it.
   */
  onSnapshot(listener: (firstT: number | null) => void): () => void {
    this.snapshotListeners.add(listener);
    return () => this.snapshotListeners.delete(listener);
  }

  /**
   * Puts archived history in front of the live rows: a run opened half-way, or a reconnect,
   * shows the whole curve, not only the last seconds. Each bucket becomes two rows (its min,
   * then its max) so a spike or a cutoff inside a bucket still shows.
   */
  backfill(h: HistoryColumns): void {
    const firstLiveT = this.buffer.length > 0 ? (this.buffer.at(LIVE_COLUMN.time, 0) ?? Infinity) : Infinity;
    const saved: (number | null)[][] = Array.from({ length: COLUMN_COUNT }, () => []);
    const savedCount = this.buffer.copyOrdered(saved);
    this.buffer.clear();
    const channel = this.next.tempChannel ?? pickTempChannel(h.temps);
    const temp = channel ? h.temps[channel] : undefined;
    const half = (h.bucketSeconds ?? 0) / 2;
    let lastT: number | null = null;
    for (let i = 0; i < h.x.length; i++) {
      const t = h.x[i];
      if (t >= firstLiveT) break;
      this.pushHistoryRow(t, h, temp, i, 'min');
      lastT = t;
      if (half > 0 && t + half < firstLiveT) {
        this.pushHistoryRow(t + half, h, temp, i, 'max');
        lastT = t + half;
      }
    }
    // The archive may lag the live stream: never draw a line across what is missing.
    if (lastT !== null && savedCount > 0 && firstLiveT - lastT > Math.max(MIN_GAP_SECONDS, GAP_FACTOR * Math.max(half * 2, this.lastDtSeconds))) {
      this.pushGap((lastT + firstLiveT) / 2);
    }
    for (let r = 0; r < savedCount; r++) {
      for (let c = 0; c < COLUMN_COUNT; c++) this.row[c] = saved[c][r];
      this.buffer.push(this.row);
    }
    this.update({ tempChannel: channel, dataVersion: this.next.dataVersion + 1 });
  }

  private pushHistoryRow(t: number, h: HistoryColumns, temp: MinMax | undefined, i: number, side: 'min' | 'max'): void {
    this.row[LIVE_COLUMN.time] = t;
    this.row[LIVE_COLUMN.volts] = h.volts[side][i];
    this.row[LIVE_COLUMN.amps] = h.amps[side][i];
    this.row[LIVE_COLUMN.watts] = h.watts[side][i];
    this.row[LIVE_COLUMN.temp] = temp ? temp[side][i] : null;
    this.buffer.push(this.row);
  }

  /** Feeds one WebSocket message for this store's topic. */
  handle(message: ServerMessage): void {
    switch (message.type) {
      case 'snapshot':
        this.update({ run: message.run, status: message.status ?? this.next.status, events: message.events });
        this.appendReadings(message.recent, message.resume !== 'resumed');
        message.events.forEach((e) => this.eventListeners.forEach((l) => l(e, false)));
        if (message.resume !== 'resumed') this.snapshotListeners.forEach((l) => l(timeColumn(message.recent)[0] ?? null));
        break;
      case 'batch': {
        this.appendReadings(message.readings, false);
        const received = timeColumn(message.readings).length;
        if (received > 0) this.update({ receivedAtMs: this.nowMs(), status: this.countFrames(received + message.dropped) });
        if (message.dropped > 0) this.update({ droppedReadings: this.next.droppedReadings + message.dropped });
        break;
      }
      case 'event':
        this.update({ events: [...this.next.events, message.event] });
        this.eventListeners.forEach((l) => l(message.event, true));
        break;
      case 'note':
        this.update({ events: withNoteChange(this.next.events, message.previous, message.event) });
        this.noteListeners.forEach((l) => l(message.eventId));
        break;
      case 'run':
        this.update({ run: message.run });
        break;
      case 'status':
        this.update({ status: message.status });
        break;
      case 'error':
        this.update({ error: message.message });
        break;
      default:
        break;
    }
  }

  /**
   * The bench's "frames ok" count moves with every reading that arrives: the server sends a
   * status only when the state changes, and its count then corrects ours.
   */
  private countFrames(readings: number): LiveView['status'] {
    const status = this.next.status;
    return status && readings > 0 ? { ...status, framesOk: status.framesOk + readings } : status;
  }

  private update(patch: Partial<LiveView>): void {
    this.next = { ...this.next, ...patch };
    if (this.scheduled) return;
    this.scheduled = true;
    this.schedule(() => {
      this.scheduled = false;
      this.view = this.next;
      this.listeners.forEach((l) => l());
    });
  }

  private appendReadings(cols: ReadingColumns, afterOutage: boolean): void {
    const times = timeColumn(cols);
    const n = times.length;
    if (n === 0) return;
    const channel = this.next.tempChannel ?? pickTempChannel(cols.temps);
    const temps = channel ? cols.temps[channel] : undefined;
    let lastT = this.buffer.last(LIVE_COLUMN.time) ?? null;
    for (let i = 0; i < n; i++) {
      const t = times[i];
      // A snapshot without a usable cursor repeats what we have: keep only what is new.
      if (lastT !== null && t <= lastT) continue;
      if (lastT !== null) {
        const dt = t - lastT;
        if (dt > Math.max(MIN_GAP_SECONDS, GAP_FACTOR * this.lastDtSeconds) && (afterOutage || this.lastDtSeconds > 0)) {
          this.pushGap((lastT + t) / 2);
        } else {
          this.lastDtSeconds = dt;
        }
      }
      this.row[LIVE_COLUMN.time] = t;
      this.row[LIVE_COLUMN.volts] = cols.volts[i];
      this.row[LIVE_COLUMN.amps] = cols.amps[i];
      this.row[LIVE_COLUMN.watts] = cols.watts[i];
      this.row[LIVE_COLUMN.temp] = temps ? temps[i] : null;
      this.buffer.push(this.row);
      lastT = t;
    }
    const last = n - 1;
    this.update({
      time: times[last],
      volts: cols.volts[last],
      amps: cols.amps[last],
      watts: cols.watts[last],
      tempChannel: channel,
      tempCelsius: temps ? temps[last] : null,
      dischargeWh: cols.dischargeWh?.[last] ?? this.next.dischargeWh,
      dischargeAh: cols.dischargeAh?.[last] ?? this.next.dischargeAh,
      chargeWh: cols.chargeWh?.[last] ?? this.next.chargeWh,
      chargeAh: cols.chargeAh?.[last] ?? this.next.chargeAh,
      dataVersion: this.next.dataVersion + 1,
    });
  }

  private pushGap(t: number): void {
    this.row.fill(null);
    this.row[LIVE_COLUMN.time] = t;
    this.buffer.push(this.row);
  }
}
