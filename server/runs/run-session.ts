import { createRunPipeline, type RunPipeline, type RunPipelineSnapshot } from '../../shared/measure/run-pipeline.js';
import { summarizeRun } from '../../shared/measure/summarize-run.js';
import { withRunDetails } from '../../shared/measure/protection-summary.js';
import type { Frame } from '../../shared/schemas/frame.js';
import type { MeasureConfigInput } from '../../shared/schemas/measure-config.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { CutoffEvent, RunEvent } from '../../shared/schemas/run-event.js';
import type { RunSummary } from '../../shared/schemas/run-summary.js';
import type { Run, RunState } from '../../shared/schemas/run.js';
import type { BatteryFacts } from './measure-config.js';
import type { RunBatch } from './run-batch.js';
import { emptyClockState, SourceClockGuard, type ClockGuardState } from './source-clock-guard.js';
import { withCurrentKeys } from '../../shared/schemas/legacy-keys.js';

/** Everything needed to pick a run up again after a restart; stored with each batch. */
export interface RunSessionSnapshot {
  version: 1;
  pipeline: RunPipelineSnapshot;
  nextSeq: number;
  nextEventSeq: number;
  state: RunState;
  /** Run time of the recovery, when there was one (for `after-recovery` stops). */
  recoveredAt: number | null;
  cutoffAt: number | null;
  cutoffCause: 'end-voltage' | 'protection' | null;
  lastElapsedSeconds: number | null;
  tempAlarmRaised: boolean;
  /** Run time the discharge last came back after a pause or a protection reconnect (absent in older snapshots). */
  resumedAt?: number | null;
  /** The source clock guard's memory (absent in snapshots from before it existed). */
  clock?: ClockGuardState;
}

type SessionFields = Omit<RunSessionSnapshot, 'pipeline' | 'version'>;

const FRESH_FIELDS: Omit<SessionFields, 'state'> = {
  nextSeq: 0, nextEventSeq: 0, recoveredAt: null, cutoffAt: null, cutoffCause: null, lastElapsedSeconds: null, tempAlarmRaised: false,
};

/**
 * The session's own fields of a stored snapshot, named one by one: the stored `pipeline`
 * must not ride along, or every later snapshot would carry the state of the first resume
 * over the live pipeline's (totals going back after a second restart).
 */
function sessionFields(previous: RunSessionSnapshot): SessionFields {
  const { nextSeq, nextEventSeq, state, recoveredAt, cutoffAt, cutoffCause, tempAlarmRaised, clock } = previous;
  // A snapshot stored before the rename names the last run time `lastElapsed`. vocab-rename: keep
  const lastElapsedSeconds = previous.lastElapsedSeconds ?? (previous as { lastElapsed?: number | null }).lastElapsed ?? null; // vocab-rename: keep
  // A snapshot stored before the renames names the clock guard's fields offsetS, lastArrivalS, suspectArrivalS. // vocab-rename: keep
  const current = clock ? (withCurrentKeys(clock) as ClockGuardState) : emptyClockState();
  return { nextSeq, nextEventSeq, state, recoveredAt, cutoffAt, cutoffCause, lastElapsedSeconds, tempAlarmRaised, clock: current };
}

/** One event with its per-run sequence number (its idempotency key in the archive). */
export interface SequencedEvent {
  eventSeq: number;
  event: RunEvent;
}

/** What one frame did to the run. */
export interface PushOutcome {
  reading: Reading | null;
  events: SequencedEvent[];
  stateChanged: boolean;
}

/**
 * One live run: the measurement core's pipeline plus the run's state machine
 * (armed → recording → cutoff → recovered → finished/aborted), its stop rule, and the
 * readings and events not yet handed to the archive. No I/O here.
 */
export class RunSession {
  readonly pipeline: RunPipeline;
  private pending: Reading[] = [];
  private pendingEvents: SequencedEvent[] = [];
  private stateDirty = false;
  private lastGoodSummary: RunSummary | null = null;
  private snap: SessionFields;
  /** Every event of the run so far (for the summary). */
  readonly events: RunEvent[];
  /** Keeps a glitched or restarted meter clock from stopping the run (see SourceClockGuard). */
  readonly clock: SourceClockGuard;

  constructor(
    public run: Run,
    readonly battery: BatteryFacts | null,
    config: MeasureConfigInput,
    previous?: RunSessionSnapshot,
    pastEvents: RunEvent[] = [],
  ) {
    this.pipeline = createRunPipeline(config, previous?.pipeline);
    this.events = [...pastEvents];
    this.snap = previous ? sessionFields(previous) : { ...FRESH_FIELDS, state: run.state, clock: emptyClockState() };
    this.clock = new SourceClockGuard(this.pipeline.gapLimit.seconds, this.snap.clock);
  }

  get state(): RunState {
    return this.snap.state;
  }

  get lastElapsedSeconds(): number | null {
    return this.snap.lastElapsedSeconds;
  }

  get readingsCount(): number {
    return this.snap.nextSeq;
  }

  /** Feeds one frame through the core and moves the state machine. */
  push(frame: Frame): PushOutcome {
    const { reading, events } = this.pipeline.push(frame);
    if (!reading) return { reading: null, events: [], stateChanged: false };
    this.pending.push(reading);
    this.snap.nextSeq++;
    this.snap.lastElapsedSeconds = reading.elapsedSeconds;
    const before = this.snap.state;
    if (before === 'armed') this.setState('recording');
    const out: SequencedEvent[] = [];
    for (const event of events) {
      out.push(this.addEvent(event));
      if (event.type === 'cutoff') this.onCutoff(event, out);
      if (event.type === 'load-on') this.snap.resumedAt = event.elapsedSeconds;
      if (event.type === 'recovery' && this.snap.state === 'cutoff') {
        this.snap.recoveredAt = event.elapsedSeconds;
        this.setState('recovered');
      }
    }
    const { highTempCelsius: high, lowTempCelsius: low } = this.run.alarms;
    // One temperature alarm per run: it calls a person; the chart shows the rest.
    if (!this.snap.tempAlarmRaised && reading.temps) {
      const temps = Object.values(reading.temps);
      const hot = high !== undefined && temps.some((c) => c >= high);
      const cold = low !== undefined && temps.some((c) => c <= low);
      if (hot || cold) {
        this.snap.tempAlarmRaised = true;
        const message = hot ? `Temperature reached ${high} °C` : `Temperature fell to ${low} °C`;
        out.push(this.addEvent({ type: 'alarm', elapsedSeconds: reading.elapsedSeconds, level: 'warning', code: hot ? 'over-temperature' : 'under-temperature', message }));
      }
    }
    return { reading, events: out, stateChanged: this.snap.state !== before };
  }

  /**
   * A cutoff moves the run to `cutoff`. The first one raises the alarm; a protection trip that
   * reconnects lets the test run on, so a later end-voltage cutoff is the one that counts (and
   * raises its own alarm). Repeated trips after the first change the state but call no one.
   */
  private onCutoff(event: CutoffEvent, out: SequencedEvent[]): void {
    const first = this.snap.cutoffAt === null;
    const endAfterTrip = !first && event.cause === 'end-voltage' && this.snap.cutoffCause !== 'end-voltage';
    if (!first && !endAfterTrip && this.snap.state !== 'recovered') return;
    this.snap.cutoffAt = event.elapsedSeconds;
    if (this.snap.cutoffCause !== 'end-voltage') this.snap.cutoffCause = event.cause;
    this.setState('cutoff');
    if ((first || endAfterTrip) && this.run.alarms.onCutoff)
      out.push(this.addEvent({ type: 'alarm', elapsedSeconds: event.elapsedSeconds, level: 'critical', code: 'cutoff', message: `Cutoff (${event.cause}) at ${event.volts.toFixed(3)} V` }));
  }

  /** Adds an event of the recorder's own (source lost, run start/stop) with the next sequence number. */
  addEvent(event: RunEvent): SequencedEvent {
    const sequenced = { eventSeq: this.snap.nextEventSeq++, event };
    this.events.push(event);
    this.pendingEvents.push(sequenced);
    return sequenced;
  }

  /** True when the run's stop rule says it is done. */
  shouldFinish(): boolean {
    const s = this.snap;
    const totals = this.pipeline.totals();
    const charging = this.run.kind === 'charge';
    switch (this.run.stopWhen) {
      case 'manual':
        return false;
      case 'target-ah':
        return (charging ? totals.chargeAh : totals.dischargeAh) >= (this.run.targetAh ?? Infinity);
      case 'target-wh':
        return (charging ? totals.chargeWh : totals.dischargeWh) >= (this.run.targetWh ?? Infinity);
      case 'after-recovery': {
        const wait = this.run.afterRecoverySeconds;
        // The end voltage ends the test; a protection's reconnect ends it when the run says a trip
        // does, or when the discharge did not come back with it (the trip was the end of the test).
        const resumed = s.recoveredAt !== null && (s.resumedAt ?? Number.NEGATIVE_INFINITY) >= s.recoveredAt;
        const tripEnded = s.recoveredAt !== null && (this.run.protectionEndsTest === true || !resumed);
        const from = s.cutoffCause === 'end-voltage' ? s.cutoffAt : tripEnded ? s.recoveredAt : null;
        return from !== null && s.lastElapsedSeconds !== null && s.lastElapsedSeconds - from >= wait;
      }
    }
  }

  /** Marks the run finished or aborted. */
  end(state: 'finished' | 'aborted'): void {
    this.addEvent({ type: 'run-stop', elapsedSeconds: this.snap.lastElapsedSeconds ?? 0, note: state });
    this.setState(state);
  }

  /**
   * The run's figures now (final once the run has ended). Never throws: should the figures
   * ever fail their schema, the last good ones stand (null before any), so one bad reading
   * can neither hide the run from every list nor keep it from being stopped.
   */
  summary(): RunSummary | null {
    try {
      const snapshot = this.pipeline.snapshot();
      const summary = summarizeRun({
        snapshot,
        events: this.events,
        acceptancePercent: this.run.acceptancePercent,
        ended: this.snap.state === 'finished' || this.snap.state === 'aborted',
        protectionEndsTest: this.run.protectionEndsTest ?? false,
        price: this.battery?.price ?? null,
        massKg: this.battery?.massKg ?? null,
        leadAcidTempCelsius: this.run.electrolyteTempCelsius ?? null,
        meterAccuracy: this.run.meterAccuracy ?? null,
      });
      this.lastGoodSummary = withRunDetails(summary, snapshot, this.events, this.run.kind);
    } catch {
      // Kept as it was: the readings are archived, so the figures can be recomputed from them.
    }
    return this.lastGoodSummary;
  }

  /** True when there is anything to archive. */
  hasPending(): boolean {
    return this.pending.length > 0 || this.pendingEvents.length > 0 || this.stateDirty;
  }

  /** Hands over what is pending as one batch for the archive, with the state to resume from. */
  takeBatch(): RunBatch {
    const readings = this.pending;
    const firstSeq = this.snap.nextSeq - readings.length;
    this.pending = [];
    const events = this.pendingEvents;
    this.pendingEvents = [];
    const final = this.snap.state === 'finished' || this.snap.state === 'aborted';
    const patch: RunBatch['patch'] = {
      readingsCount: this.snap.nextSeq,
      pipelineState: final ? null : JSON.stringify(this.snapshot()),
    };
    // The figures go with every batch, so the stored run is never more than one batch behind
    // what viewers saw (a restart must not show totals from the run's first minute).
    const summary = this.summary();
    if (summary) patch.summary = summary;
    if (this.stateDirty || final) {
      patch.state = this.snap.state;
      patch.summary = summary;
      if (final) patch.endedAt = new Date();
    }
    this.stateDirty = false;
    return { runId: this.run.id, firstSeq, readings, events, patch };
  }

  /** The resumable state (JSON-safe). */
  snapshot(): RunSessionSnapshot {
    return { ...this.snap, clock: { ...this.clock.state }, version: 1, pipeline: this.pipeline.snapshot() };
  }

  private setState(state: RunState): void {
    this.snap.state = state;
    this.run = { ...this.run, state };
    this.stateDirty = true;
  }
}
