import { createRunPipeline, type RunPipeline, type RunPipelineSnapshot } from '../../shared/measure/run-pipeline.js';
import { summarizeRun } from '../../shared/measure/summarize-run.js';
import { withRunDetails } from '../../shared/measure/protection-summary.js';
import type { Frame } from '../../shared/schemas/frame.js';
import type { MeasureConfigInput } from '../../shared/schemas/measure-config.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import type { RunSummary } from '../../shared/schemas/run-summary.js';
import type { Run, RunState } from '../../shared/schemas/run.js';
import type { ArchiveBatch } from '../archive/archive-batch.js';
import { encodeChunk } from '../archive/chunk-encode.js';
import { readingsToColumns } from '../archive/reading-columns.js';
import type { BatteryFacts } from './measure-config.js';
import { emptyClockState, SourceClockGuard, type ClockGuardState } from './source-clock-guard.js';

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
  lastElapsed: number | null;
  tempAlarmRaised: boolean;
  /** The source clock guard's memory (absent in snapshots from before it existed). */
  clock?: ClockGuardState;
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
  private snap: Omit<RunSessionSnapshot, 'pipeline' | 'version'>;
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
    this.snap = previous
      ? { ...previous }
      : { nextSeq: 0, nextEventSeq: 0, state: run.state, recoveredAt: null, cutoffAt: null, cutoffCause: null, lastElapsed: null, tempAlarmRaised: false };
    this.snap.clock ??= emptyClockState();
    this.clock = new SourceClockGuard(this.pipeline.config.maxGapSeconds, this.snap.clock);
  }

  get state(): RunState {
    return this.snap.state;
  }

  get lastElapsed(): number | null {
    return this.snap.lastElapsed;
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
    this.snap.lastElapsed = reading.elapsedSeconds;
    const before = this.snap.state;
    if (before === 'armed') this.setState('recording');
    const out: SequencedEvent[] = [];
    for (const event of events) {
      out.push(this.addEvent(event));
      if (event.type === 'cutoff' && this.snap.cutoffAt === null) {
        this.snap.cutoffAt = event.t;
        this.snap.cutoffCause = event.cause;
        this.setState('cutoff');
        if (this.run.alarms.onCutoff)
          out.push(this.addEvent({ type: 'alarm', t: event.t, level: 'critical', code: 'cutoff', message: `Cutoff (${event.cause}) at ${event.volts.toFixed(3)} V` }));
      }
      if (event.type === 'recovery' && this.snap.state === 'cutoff') {
        this.snap.recoveredAt = event.t;
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
        out.push(this.addEvent({ type: 'alarm', t: reading.elapsedSeconds, level: 'warning', code: hot ? 'over-temperature' : 'under-temperature', message }));
      }
    }
    return { reading, events: out, stateChanged: this.snap.state !== before };
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
        // No reconnect follows an end-voltage cutoff (the pack's protection never opened).
        const from = s.recoveredAt ?? (s.cutoffCause === 'end-voltage' ? s.cutoffAt : null);
        return from !== null && s.lastElapsed !== null && s.lastElapsed - from >= wait;
      }
    }
  }

  /** Marks the run finished or aborted. */
  end(state: 'finished' | 'aborted'): void {
    this.addEvent({ type: 'run-stop', t: this.snap.lastElapsed ?? 0, note: state });
    this.setState(state);
  }

  /** The run's figures now (final once the run has ended). */
  summary(): RunSummary {
    const snapshot = this.pipeline.snapshot();
    const summary = summarizeRun({
      snapshot,
      events: this.events,
      acceptancePercent: this.run.acceptancePercent,
      price: this.battery?.price ?? null,
      massKg: this.battery?.massKg ?? null,
    });
    return withRunDetails(summary, snapshot, this.events, this.run.kind);
  }

  /** True when there is anything to archive. */
  hasPending(): boolean {
    return this.pending.length > 0 || this.pendingEvents.length > 0 || this.stateDirty;
  }

  /** Hands over what is pending as one archive batch, with the state to resume from. */
  takeBatch(): ArchiveBatch {
    const readings = this.pending;
    const firstSeq = this.snap.nextSeq - readings.length;
    this.pending = [];
    const events = this.pendingEvents;
    this.pendingEvents = [];
    const final = this.snap.state === 'finished' || this.snap.state === 'aborted';
    const block =
      readings.length > 0
        ? encodeChunk(firstSeq, readingsToColumns(readings))
        : null;
    const patch: ArchiveBatch['patch'] = {
      readingsCount: this.snap.nextSeq,
      pipelineState: final ? null : JSON.stringify(this.snapshot()),
    };
    if (this.stateDirty || final) {
      patch.state = this.snap.state;
      patch.summary = this.summary();
      if (final) patch.endedAt = new Date();
    }
    this.stateDirty = false;
    return { runId: this.run.id, block, events, patch };
  }

  /** The resumable state (JSON-safe). */
  snapshot(): RunSessionSnapshot {
    return { version: 1, pipeline: this.pipeline.snapshot(), ...this.snap };
  }

  private setState(state: RunState): void {
    this.snap.state = state;
    this.run = { ...this.run, state };
    this.stateDirty = true;
  }
}
