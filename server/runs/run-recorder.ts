import type { StartRunRequestSchema, StoredRunEvent } from '../../shared/schemas/api-runs.js';
import type { BenchStatus } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import type { Reading } from '../../shared/schemas/reading.js';
import { LIVE_RUN_STATES, type Run } from '../../shared/schemas/run.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import type { z } from 'zod';
import { ConflictError, InvalidInputError, notFound } from '../domain/domain-errors.js';
import { ListenerSet } from '../ingest/listener-set.js';
import { measureConfigFor, type BatteryFacts, type SourceFacts } from './measure-config.js';
import { MissingProtectionThresholdError, resolveProtectionChecks } from './resolve-protection-checks.js';
import type { RunBatchSink } from './run-batch.js';
import { RunSession, type RunSessionSnapshot, type SequencedEvent } from './run-session.js';
import type { NoteChangeRecord } from './notes-repo.js';
import type { RunsRepo } from './runs-repo.js';
import { MS_PER_S } from '../../shared/units/time.js';
import { createLogger, type Logger } from '../log/logger.js';

/** Where frames come from: the ingest area's BenchManager satisfies this. */
export interface FrameFeed {
  onFrame(listener: (benchId: number, frame: Frame) => void): () => void;
  onStatus?(listener: (benchId: number, status: BenchStatus) => void): () => void;
}

/** Readings not yet archived are handed to the archive at least this often. */
export const FLUSH_INTERVAL_MS = 1000;
/** …or as soon as this many are pending (a fast meter). */
export const FLUSH_READINGS = 2000;
/** Bench states that mean the meter is not delivering. */
const SOURCE_DOWN_STATES = new Set(['stale', 'error', 'reconnecting', 'idle']);

export interface RunRecorderDeps {
  repo: RunsRepo;
  /** Where the runs' batches go (the archive); it encodes and stores them. */
  archive: RunBatchSink;
  getBattery: (id: number) => Promise<BatteryFacts | null>;
  /** Checks a bench id before a run starts on it (default: any id is taken). */
  benchExists?: (id: number) => Promise<boolean>;
  /** What a bench's source says of its pace (its poll period), for the run's gap limit; default: nothing known. */
  benchSourceFacts?: (id: number) => Promise<SourceFacts | null>;
  /** Readies a bench just before a run is armed on it (a simulated bench gets a fresh pack). */
  prepareBench?: (id: number) => Promise<unknown>;
  log?: Logger;
  /** Injected timer (tests drive flushes by hand with `flushAll`). */
  setInterval?: (fn: () => void, ms: number) => { unref?: () => void };
  clearInterval?: (handle: unknown) => void;
  /** Server clock in ms, for how long a meter was away (default Date.now). */
  nowMs?: () => number;
}

type StartRequest = z.infer<typeof StartRunRequestSchema>;

/** A reading kept outside the archive: its index in the run, its frame on the run's time line, when it arrived (Unix s). */
export interface KeptReading {
  index: number;
  frame: Frame;
  arrivalSeconds: number;
}

/** How far past a live run's latest reading a note may be placed (a browser clock a little ahead). */
export const NOTE_AHEAD_OF_LIVE_S = 10;

/**
 * Records live runs: one run per bench at a time. Every frame of a bench with a live run
 * goes through that run's RunSession (the measurement core), out to listeners (the
 * WebSocket hub) and, in batches, to the archive. Totals live here on the server, so they
 * never depend on a browser being open.
 */
export class RunRecorder {
  private readonly sessions = new Map<number, RunSession>();
  private readonly byBench = new Map<number, number>();
  /** Benches whose run is being created (between the check and the register, across awaits). */
  private readonly starting = new Set<number>();
  private readonly unsubscribe: (() => void)[] = [];
  private timer: unknown = null;
  /** Every reading a run accepts, with its index in the run (the archive's sequence number). */
  readonly readings = new ListenerSet<[runId: number, reading: Reading, index: number]>((e) => this.log.error('run readings listener failed', e));
  readonly events = new ListenerSet<[runId: number, event: SequencedEvent | StoredRunEvent]>((e) => this.log.error('run event listener failed', e));
  readonly runChanges = new ListenerSet<[run: Run]>((e) => this.log.error('run change listener failed', e));
  readonly noteChanges = new ListenerSet<[change: NoteChangeRecord]>((e) => this.log.error('note change listener failed', e));
  private readonly log: Logger;

  constructor(private readonly deps: RunRecorderDeps) {
    this.log = deps.log ?? createLogger('runs');
  }

  /** Subscribes to a frame feed and starts the flush timer. */
  attach(feed: FrameFeed): void {
    this.unsubscribe.push(feed.onFrame((benchId, frame) => this.onFrame(benchId, frame)));
    if (feed.onStatus) this.unsubscribe.push(feed.onStatus((benchId, status) => this.onStatus(benchId, status)));
    const every = this.deps.setInterval ?? ((fn, ms) => setInterval(fn, ms));
    const handle = every(() => this.flushSpread(), FLUSH_INTERVAL_MS);
    handle.unref?.();
    this.timer = handle;
  }

  /** Picks up runs that were live when the server stopped, from their archived state. */
  async resume(): Promise<Run[]> {
    const resumed: Run[] = [];
    for (const run of await this.deps.repo.listLive()) {
      try {
        const raw = await this.deps.repo.getPipelineState(run.id);
        const previous = raw ? (JSON.parse(raw) as RunSessionSnapshot) : undefined;
        const battery = run.batteryId ? await this.deps.getBattery(run.batteryId) : null;
        const past = (await this.deps.repo.events(run.id)).map((e) => e.event);
        const source = run.benchId !== null ? await this.sourceFacts(run.benchId) : null;
        const session = new RunSession(run, battery, measureConfigFor(run, battery, source), previous, past);
        this.register(session);
        resumed.push(run);
        this.log.info(`run ${run.id} resumed at ${session.readingsCount} readings`);
      } catch (err) {
        this.log.error(`run ${run.id} could not be resumed`, err);
      }
    }
    return resumed;
  }

  /**
   * Pushes readings a sink kept on disk (the journal) back through a resumed run, before
   * its meter is heard again: those past what the archive holds, in order, as long as the
   * indexes follow on. Returns how many went in.
   */
  replay(runId: number, kept: readonly KeptReading[]): number {
    const session = this.sessions.get(runId);
    if (!session) return 0;
    const expected = kept.filter((k) => k.index >= session.readingsCount).length;
    let replayed = 0;
    let last: KeptReading | null = null;
    for (const k of kept) {
      if (k.index < session.readingsCount) continue;
      if (k.index !== session.readingsCount || !this.sessions.has(runId)) break;
      this.record(session, k.frame);
      if (session.readingsCount !== k.index + 1) break; // the core refused it: what follows cannot be trusted
      replayed++;
      last = k;
    }
    if (replayed < expected)
      this.log.warn(`run ${runId}: replay stopped after ${replayed} of the journalled readings (indexes did not follow on)`);
    if (last) session.clock.resumeAfter(last.frame.t, last.arrivalSeconds);
    return replayed;
  }

  /** Starts a run on a bench (a ConflictError when the bench already records one). */
  async start(req: StartRequest, userId: number | null): Promise<Run> {
    if (this.byBench.has(req.benchId)) throw new ConflictError(`Bench ${req.benchId} is already recording run ${this.byBench.get(req.benchId)}`);
    // A double-clicked Start sends two requests: the second must not slip in while the first awaits the database.
    if (this.starting.has(req.benchId)) throw new ConflictError(`A run is already starting on bench ${req.benchId}`);
    this.starting.add(req.benchId);
    try {
      return await this.create(req, userId);
    } finally {
      this.starting.delete(req.benchId);
    }
  }

  private async create(req: StartRequest, userId: number | null): Promise<Run> {
    if (this.deps.benchExists && !(await this.deps.benchExists(req.benchId))) throw new InvalidInputError(`Bench ${req.benchId} does not exist`, { benchId: ['no such bench'] });
    const battery = await this.deps.getBattery(req.batteryId);
    if (!battery) throw new InvalidInputError(`Battery ${req.batteryId} does not exist`, { batteryId: ['no such battery'] });
    const { benchId, batteryId, name, tags, protectionChecks: requested, ...rest } = req;
    const source = await this.sourceFacts(benchId);
    // The meter's accuracy is kept with the run: a later change to the bench does not move this run's uncertainty.
    const config = { ...rest, protectionChecks: this.protectionChecksFor(req, requested, battery), meterAccuracy: source?.meterAccuracy ?? null };
    // Before the run exists, so it records the fresh pack from its first reading.
    await this.deps.prepareBench?.(benchId);
    const run = await this.deps.repo.create({
      name, tags, origin: 'live', benchId, batteryId, state: 'armed', config, createdById: userId, startedAt: new Date(),
    });
    const session = new RunSession(run, battery, measureConfigFor(config, battery, source));
    this.register(session);
    this.emitEvent(run.id, session.addEvent({ type: 'run-start', elapsedSeconds: 0 }));
    this.deps.archive.enqueue(session.takeBatch());
    this.runChanges.emit(run);
    return run;
  }

  private async sourceFacts(benchId: number): Promise<SourceFacts | null> {
    return this.deps.benchSourceFacts ? this.deps.benchSourceFacts(benchId) : null;
  }

  /** The protections a protection-check run times (an InvalidInputError when one has no threshold, or there is nothing to check). */
  private protectionChecksFor(req: StartRequest, requested: StartRequest['protectionChecks'], battery: BatteryFacts) {
    if (req.kind !== 'protection-check') return [];
    let checks;
    try {
      checks = resolveProtectionChecks(requested, battery.protectionSpecs);
    } catch (err) {
      if (err instanceof MissingProtectionThresholdError) throw new InvalidInputError(err.message, { protectionChecks: [err.message] });
      throw err;
    }
    if (checks.length === 0 && req.tempProtections.length === 0) {
      const message = "Nothing to check: list the protections to time, or state them in the pack's record";
      throw new InvalidInputError(message, { protectionChecks: [message] });
    }
    return checks;
  }

  /** Stops a live run: finished, or aborted when `abort`. */
  async stop(runId: number, abort: boolean): Promise<Run> {
    const session = this.sessions.get(runId);
    if (!session) {
      const run = await this.deps.repo.get(runId);
      if (!run) throw notFound(`Run ${runId}`);
      if (run.origin === 'live' && LIVE_RUN_STATES.includes(run.state)) return this.endStranded(run, abort ? 'aborted' : 'finished');
      throw new ConflictError(`Run ${runId} is ${run.state}, not live`);
    }
    return this.endSession(session, abort ? 'aborted' : 'finished');
  }

  /**
   * Ends a run the database still calls live but no session records here (its stored state
   * could not be resumed): as it stands, so a person can always close it.
   */
  private endStranded(run: Run, state: 'finished' | 'aborted'): Run {
    const endedAt = new Date();
    this.deps.archive.enqueue({ runId: run.id, firstSeq: run.readingsCount, readings: [], events: [], patch: { state, endedAt, pipelineState: null } });
    this.log.warn(`run ${run.id} was ${run.state} without a live session; ended as ${state}`);
    const ended: Run = { ...run, state, endedAt: endedAt.toISOString() };
    this.runChanges.emit(ended);
    return ended;
  }

  /** Adds an annotation at a run time (default: the latest reading) and tells every viewer. */
  async annotate(runId: number, text: string, elapsedSeconds: number | undefined, author: { id: number; name: string }): Promise<StoredRunEvent> {
    const session = this.sessions.get(runId);
    const stored = session ? null : await this.deps.repo.get(runId);
    if (!session && !stored) throw notFound(`Run ${runId}`);
    // A note belongs within the run: up to its latest reading (live), or its length (ended).
    const lengthSeconds = session ? (session.lastElapsedSeconds ?? 0) + NOTE_AHEAD_OF_LIVE_S : (stored?.summary?.durationSeconds ?? null);
    if (elapsedSeconds !== undefined && lengthSeconds !== null && elapsedSeconds > lengthSeconds) {
      const what = session ? 'the latest reading' : 'the end of the run';
      throw new InvalidInputError(`The note's time (${elapsedSeconds} s) is after ${what} (${lengthSeconds.toFixed(1)} s)`, { elapsedSeconds: [`at most ${lengthSeconds.toFixed(1)} s`] });
    }
    const at = elapsedSeconds ?? session?.lastElapsedSeconds ?? 0;
    const note = await this.deps.repo.insertEvent(runId, { type: 'annotation', elapsedSeconds: at, text, author: author.name }, author.id);
    session?.events.push(note.event);
    this.events.emit(runId, note);
    return note;
  }

  /** A note was edited or removed: a live run's timeline follows, and every viewer is told. */
  noteChanged(change: NoteChangeRecord): void {
    const events = this.sessions.get(change.runId)?.events;
    if (events) {
      const i = events.findIndex((e) => e.type === 'annotation' && e.elapsedSeconds === change.previous.elapsedSeconds && e.text === change.previous.text && e.author === change.previous.author);
      if (i >= 0) {
        if (change.next) events[i] = change.next;
        else events.splice(i, 1);
      }
    }
    this.noteChanges.emit(change);
  }

  /** Adds an event another area records (an alarm's acknowledgement) to a run's timeline and tells every viewer. */
  async addStoredEvent(runId: number, event: RunEvent, userId: number | null): Promise<StoredRunEvent> {
    const stored = await this.deps.repo.insertEvent(runId, event, userId);
    this.sessions.get(runId)?.events.push(stored.event);
    this.events.emit(runId, stored);
    return stored;
  }

  /** Tells viewers about a new name or tags (and keeps a live session's copy current). */
  renamed(run: Run): void {
    const session = this.sessions.get(run.id);
    if (session) session.run = { ...session.run, name: run.name, tags: run.tags };
    this.runChanges.emit(run);
  }

  /** A live run as viewers should see it now (the database row lags by up to a batch). */
  liveView(session: RunSession): Run {
    return { ...session.run, readingsCount: session.readingsCount, summary: session.summary() };
  }

  /** Overlays the live state on a run read from the database, when it is recording here. */
  withLive(run: Run): Run {
    const session = this.sessions.get(run.id);
    return session ? { ...run, ...this.liveView(session), name: run.name, tags: run.tags } : run;
  }

  /** The live session of a run, if it is recording. */
  session(runId: number): RunSession | undefined {
    return this.sessions.get(runId);
  }

  /** The run recording on a bench, if any. */
  runOnBench(benchId: number): number | undefined {
    return this.byBench.get(benchId);
  }

  /** Hands everything pending to the archive (timer, shutdown, tests). */
  flushAll(): void {
    for (const session of this.sessions.values()) if (session.hasPending()) this.deps.archive.enqueue(session.takeBatch());
  }

  /**
   * The timer's flush: one run per turn of the event loop, so encoding twenty runs'
   * batches never holds up frames waiting to go out to viewers.
   */
  private flushSpread(): void {
    const queue = [...this.sessions.values()];
    const next = () => {
      const session = queue.shift();
      if (!session) return;
      if (this.sessions.has(session.run.id) && session.hasPending()) this.deps.archive.enqueue(session.takeBatch());
      setImmediate(next);
    };
    next();
  }

  /** Stops listening and hands what is pending to the archive; runs stay live for the next start. */
  detach(): void {
    for (const off of this.unsubscribe.splice(0)) off();
    if (this.timer) (this.deps.clearInterval ?? ((h) => clearInterval(h as NodeJS.Timeout)))(this.timer);
    this.timer = null;
    this.flushAll();
  }

  private register(session: RunSession): void {
    this.sessions.set(session.run.id, session);
    if (session.run.benchId !== null) this.byBench.set(session.run.benchId, session.run.id);
  }

  private onFrame(benchId: number, frame: Frame): void {
    const runId = this.byBench.get(benchId);
    const session = runId === undefined ? undefined : this.sessions.get(runId);
    if (!session) return;
    // Frames arrive checked: every source validates each frame where it makes it (ingest/frame-limits.ts).
    const { frames } = session.clock.accept(frame, (this.deps.nowMs ?? Date.now)() / MS_PER_S);
    for (const f of frames) if (this.sessions.has(session.run.id)) this.record(session, f);
  }

  /** One frame on the run's time line through the core, out to viewers and towards the archive. */
  private record(session: RunSession, frame: Frame): void {
    const out = session.push(frame);
    if (out.reading) this.readings.emit(session.run.id, out.reading, session.readingsCount - 1);
    for (const e of out.events) this.emitEvent(session.run.id, e);
    if (out.stateChanged) this.runChanges.emit(this.liveView(session));
    if (session.shouldFinish()) void this.endSession(session, 'finished').catch((err) => this.log.error(`run ${session.run.id} did not end cleanly`, err));
    else if (session.hasPending() && out.stateChanged) this.deps.archive.enqueue(session.takeBatch());
    else if (session.readingsCount % FLUSH_READINGS === 0) this.deps.archive.enqueue(session.takeBatch());
  }

  private onStatus(benchId: number, status: BenchStatus): void {
    const runId = this.byBench.get(benchId);
    const session = runId === undefined ? undefined : this.sessions.get(runId);
    if (!session || session.state === 'armed') return;
    const down = SOURCE_DOWN_STATES.has(status.state);
    const lastWasLost = [...session.events].reverse().find((e) => e.type === 'source-lost' || e.type === 'source-restored')?.type === 'source-lost';
    const t = session.lastElapsedSeconds ?? 0;
    if (down && !lastWasLost) this.emitEvent(session.run.id, session.addEvent({ type: 'source-lost', elapsedSeconds: t, reason: status.message ?? status.state }));
    if (status.state === 'receiving' && lastWasLost) this.emitEvent(session.run.id, session.addEvent({ type: 'source-restored', elapsedSeconds: t }));
  }

  private async endSession(session: RunSession, state: 'finished' | 'aborted'): Promise<Run> {
    const id = session.run.id;
    if (!this.sessions.has(id)) return session.run;
    this.sessions.delete(id);
    if (session.run.benchId !== null && this.byBench.get(session.run.benchId) === id) this.byBench.delete(session.run.benchId);
    session.end(state);
    const summary = session.summary();
    const batch = session.takeBatch();
    this.deps.archive.enqueue(batch);
    const run: Run = { ...session.run, state, summary, readingsCount: session.readingsCount, endedAt: (batch.patch.endedAt ?? new Date()).toISOString() };
    this.runChanges.emit(run);
    return run;
  }

  private emitEvent(runId: number, e: SequencedEvent): void {
    this.events.emit(runId, e);
  }
}
