import type { PlannedStep } from '../../shared/measure/programme-plan.js';
import { programmeRoundTrips } from '../../shared/measure/programme-round-trip.js';
import type { ProgrammeControlAction, ProgrammeRunState, StepEndCause, StepOutcome, StepResult } from '../../shared/schemas/programme-run.js';
import type { ProgrammeStepEvent } from '../../shared/schemas/run-event.js';
import type { Clock, TimerHandle } from '../ingest/clock.js';
import type { CommandLogEntry } from './instrument-control.js';
import { readingTrip, silenceTrip, type OutputsOn, type SafetyLimits } from './safety-net.js';
import { allOutputsOff, applyStep, reasonOf, type BenchInstruments } from './step-actions.js';
import { SETTLE_WINDOW_SECONDS, stepEndReason, stepTimeoutFault, stepTotals, type ProgrammeReading, type StepEnd } from './step-conditions.js';
import { MS_PER_S } from '../../shared/units/time.js';
import type { Logger } from '../log/logger.js';

/** How often the executor checks the time, the meter's silence and the steps' time limits, ms. */
export const TICK_MS = 250;
/** How often each instrument is read back (also the keep-alive its watchdog waits for), ms. */
export const POLL_MS = 1000;
/** The instrument-side watchdog: outputs off when the server has sent nothing for this long, s. */
export const WATCHDOG_SECONDS = 5;

/** What the executor needs from the world; no HTTP, no database. */
export interface ExecutorDeps {
  plan: readonly PlannedStep[];
  instruments: BenchInstruments;
  clock: Clock;
  limits: SafetyLimits;
  /** A step started, ended, was skipped, paused, resumed, failed or aborted (for the run's timeline). */
  onStepEvent(event: ProgrammeStepEvent): void;
  /** Anything the live page shows changed. */
  onChange(): void;
  /** Every command exchange with an instrument (the run's command log). */
  onCommand?(entry: CommandLogEntry): void;
  log?: Logger;
}

/** The executor's state as the live page and the API show it. */
export interface ExecutorView {
  state: ProgrammeRunState;
  currentIndex: number | null;
  stepStartedAtMs: number | null;
  results: StepResult[];
  failReason: string | null;
  watchdogArmed: string[];
}

/**
 * Runs a programme's steps on a bench's instruments, one at a time, from the run's live readings:
 * starts each step, ends it on its condition, and records its figures. The safety net (floor,
 * ceiling, over-temperature, meter silence, instrument faults) switches every output off and
 * ends the programme, whatever the step.
 */
export class ProgrammeExecutor {
  private state: ProgrammeRunState = 'starting';
  private index: number | null = null;
  /** True once the first step has begun (a reading before that begins it). */
  private begun = false;
  private readonly results: StepResult[] = [];
  private failReason: string | null = null;
  private readonly armed: string[] = [];
  private readonly on: OutputsOn = { load: false, supply: false };
  /** Bumped whenever the wanted state changes, so a command sequence for an older one stops short. */
  private generation = 0;
  private applying: Promise<void> = Promise.resolve();
  private latest: ProgrammeReading | null = null;
  private lastReadingAtMs: number;
  private stepStart: ProgrammeReading | null = null;
  private stepStartedAtMs: number | null = null;
  private pausedAtMs: number | null = null;
  private voltsWindow: Array<{ t: number; volts: number }> = [];
  private timer: TimerHandle | null = null;
  private lastPollMs = 0;
  private polling = false;
  private readonly unsubscribe: Array<() => void> = [];
  private resolveDone!: (state: ProgrammeRunState) => void;
  /** Resolves with the final state once the programme has ended and its outputs are off. */
  readonly done: Promise<ProgrammeRunState>;

  constructor(private readonly deps: ExecutorDeps) {
    this.lastReadingAtMs = deps.clock.nowMs();
    this.done = new Promise((resolve) => (this.resolveDone = resolve));
  }

  /** Arms the watchdogs, switches everything off, and begins the first step at the next reading. */
  async start(): Promise<void> {
    for (const instrument of [this.deps.instruments.load, this.deps.instruments.supply]) {
      if (!instrument) continue;
      if (this.deps.onCommand) this.unsubscribe.push(instrument.onCommand(this.deps.onCommand));
    }
    this.lastReadingAtMs = this.deps.clock.nowMs();
    this.schedule();
    try {
      for (const instrument of [this.deps.instruments.load, this.deps.instruments.supply]) {
        if (instrument && (await instrument.armWatchdog(WATCHDOG_SECONDS))) this.armed.push(instrument.id);
      }
      const failures = await allOutputsOff(this.deps.instruments, this.on);
      if (failures.length > 0) throw new Error(failures.join('; '));
    } catch (error) {
      return this.halt('failed', reasonOf(error));
    }
    if (this.isOver()) return;
    this.state = 'running';
    if (this.latest) this.beginStep(0);
    this.deps.onChange();
  }

  /** One reading of the run: the safety net first, then the current step's end test. */
  onReading(reading: ProgrammeReading): void {
    if (this.isOver()) return;
    this.latest = reading;
    this.lastReadingAtMs = this.deps.clock.nowMs();
    const trip = readingTrip(reading, this.on, this.deps.limits);
    if (trip) return void this.halt('failed', trip);
    if (this.state !== 'running') return;
    if (!this.begun) return this.beginStep(0);
    if (this.index === null) return;
    this.remember(reading);
    this.checkStep();
  }

  /** A technician's pause, resume, skip or abort. */
  control(action: ProgrammeControlAction): void {
    if (this.isOver()) return;
    if (action === 'abort') return void this.halt('aborted', 'aborted by a technician');
    if (action === 'pause' && this.state === 'running' && this.index !== null) {
      this.state = 'paused';
      this.pausedAtMs = this.deps.clock.nowMs();
      this.generation++;
      this.emit('pause');
      this.enqueue(async () => void (await allOutputsOff(this.deps.instruments, this.on)));
    } else if (action === 'resume' && this.state === 'paused') {
      this.stepStartedAtMs! += this.deps.clock.nowMs() - this.pausedAtMs!;
      this.pausedAtMs = null;
      this.state = 'running';
      this.emit('resume');
      this.drive();
    } else if (action === 'skip' && (this.state === 'running' || this.state === 'paused') && this.index !== null) {
      this.state = 'running';
      this.pausedAtMs = null;
      this.endStep({ cause: 'skipped', reason: 'skipped by a technician' }, 'skipped');
    }
    this.deps.onChange();
  }

  /** Where the programme stands. */
  view(): ExecutorView {
    return {
      state: this.state,
      currentIndex: this.index,
      stepStartedAtMs: this.stepStartedAtMs === null ? null : this.stepStartedAtMs + (this.pausedAtMs === null ? 0 : this.deps.clock.nowMs() - this.pausedAtMs),
      results: [...this.results],
      failReason: this.failReason,
      watchdogArmed: [...this.armed],
    };
  }

  /** Round trips of the steps finished so far. */
  roundTrips() {
    return programmeRoundTrips(this.results);
  }

  private isOver(): boolean {
    return this.state === 'finished' || this.state === 'failed' || this.state === 'aborted';
  }

  private stepSeconds(): number {
    if (this.stepStartedAtMs === null) return 0;
    return ((this.pausedAtMs ?? this.deps.clock.nowMs()) - this.stepStartedAtMs) / MS_PER_S;
  }

  private beginStep(index: number): void {
    this.begun = true;
    this.index = index;
    this.stepStart = this.latest;
    this.stepStartedAtMs = this.deps.clock.nowMs();
    this.voltsWindow = [];
    if (this.latest) this.remember(this.latest);
    this.emit('start');
    this.drive();
    this.deps.onChange();
  }

  /** Sends the current step's commands (after any still in flight); a failure fails the programme safe. */
  private drive(): void {
    const gen = ++this.generation;
    const planned = this.deps.plan[this.index!]!;
    this.enqueue(() => applyStep(planned.step, this.deps.instruments, this.on, () => gen === this.generation && !this.isOver()));
  }

  private enqueue(work: () => Promise<void>): void {
    this.applying = this.applying.then(async () => {
      if (this.isOver()) return;
      try {
        await work();
      } catch (error) {
        this.halt('failed', reasonOf(error));
      }
    });
  }

  private remember(r: ProgrammeReading): void {
    this.voltsWindow.push({ t: r.elapsedSeconds, volts: r.volts });
    // Keep one reading at or before the window's start, and everything after it.
    while (this.voltsWindow.length > 1 && this.voltsWindow[1]!.t <= r.elapsedSeconds - SETTLE_WINDOW_SECONDS) this.voltsWindow.shift();
  }

  private checkStep(): void {
    if (this.state !== 'running' || this.index === null || !this.latest || !this.stepStart) return;
    const first = this.voltsWindow[0];
    const progress = {
      step: this.deps.plan[this.index]!.step,
      stepSeconds: this.stepSeconds(),
      start: this.stepStart,
      latest: this.latest,
      voltsWindowAgo: first && first.t <= this.latest.elapsedSeconds - SETTLE_WINDOW_SECONDS ? first.volts : null,
    };
    const fault = stepTimeoutFault(progress);
    if (fault) return void this.halt('failed', fault);
    const end = stepEndReason(progress);
    if (end) this.endStep(end, 'done');
  }

  private endStep(end: StepEnd, outcome: StepOutcome): void {
    this.record(end.cause, end.reason, outcome);
    this.emit(outcome === 'skipped' ? 'skip' : 'end', end.reason);
    const next = this.index! + 1;
    if (next < this.deps.plan.length) return this.beginStep(next);
    this.generation++;
    this.index = null;
    this.stepStartedAtMs = null;
    this.enqueue(async () => {
      const failures = await allOutputsOff(this.deps.instruments, this.on);
      if (failures.length > 0) throw new Error(failures.join('; '));
      this.finish('finished');
    });
    this.deps.onChange();
  }

  private record(cause: StepEndCause, reason: string, outcome: StepOutcome): void {
    const planned = this.deps.plan[this.index!]!;
    const start = this.stepStart ?? this.latest;
    const totals = start && this.latest ? stepTotals(start, this.latest) : { chargeAh: 0, chargeWh: 0, dischargeAh: 0, dischargeWh: 0 };
    this.results.push({
      index: planned.index, label: planned.label, kind: planned.step.kind, outcome, cause, reason,
      startElapsedSeconds: start?.elapsedSeconds ?? 0, endElapsedSeconds: this.latest?.elapsedSeconds ?? 0, ...totals, endVolts: this.latest?.volts ?? null,
    });
  }

  /** Fails safe or aborts: every output off at once (not behind queued commands), the step recorded, the programme over. */
  private halt(state: 'failed' | 'aborted', reason: string): void {
    if (this.isOver()) return;
    this.generation++;
    if (this.index !== null) this.record(state === 'aborted' ? 'aborted' : 'fault', reason, state === 'aborted' ? 'aborted' : 'failed');
    this.emit(state === 'aborted' ? 'abort' : 'fail', reason);
    this.failReason = reason;
    this.index = null;
    this.finish(state, false);
    // `done` waits for the off commands, so whoever closes the ports next cannot cut them off.
    void allOutputsOff(this.deps.instruments, this.on)
      .then((failures) => {
        for (const failure of failures) this.deps.log?.warn(`programme ${state}: ${failure}`);
      })
      .finally(() => this.resolveDone(state));
  }

  private finish(state: 'finished' | 'failed' | 'aborted', resolve = true): void {
    if (this.state === state) return;
    this.state = state;
    this.stepStartedAtMs = null;
    this.pausedAtMs = null;
    if (this.timer) this.deps.clock.clearTimeout(this.timer);
    this.timer = null;
    for (const off of this.unsubscribe.splice(0)) off();
    this.deps.onChange();
    if (resolve) this.resolveDone(state);
  }

  private emit(phase: ProgrammeStepEvent['phase'], reason?: string): void {
    const index = this.index ?? 0;
    const label = this.deps.plan[index]?.label ?? '';
    this.deps.onStepEvent({ type: 'programme-step', elapsedSeconds: this.latest?.elapsedSeconds ?? 0, phase, index, label, ...(reason ? { reason } : {}) });
  }

  private schedule(): void {
    this.timer = this.deps.clock.setTimeout(() => this.tick(), TICK_MS);
  }

  /** The clock's turn: meter silence, time limits, and the instruments' read-back (their keep-alive). */
  private tick(): void {
    this.timer = null;
    if (this.isOver()) return;
    const now = this.deps.clock.nowMs();
    const silent = this.state !== 'paused' ? silenceTrip(this.lastReadingAtMs, now, this.deps.limits) : null;
    if (silent) return void this.halt('failed', silent);
    this.checkStep();
    if (this.isOver()) return;
    if (now - this.lastPollMs >= POLL_MS && !this.polling) {
      this.lastPollMs = now;
      void this.poll();
    }
    this.schedule();
  }

  private async poll(): Promise<void> {
    this.polling = true;
    try {
      for (const instrument of [this.deps.instruments.load, this.deps.instruments.supply]) if (instrument && !this.isOver()) await instrument.read();
    } catch (error) {
      this.halt('failed', reasonOf(error));
    } finally {
      this.polling = false;
    }
  }
}
