import { chargeCeilingVolts, programmeProblems, safetyFloorVolts, type PackLimits } from '../../shared/measure/programme-limits.js';
import { createLogger } from '../log/logger.js';
import { planSteps } from '../../shared/measure/programme-plan.js';
import { ChemistrySchema } from '../../shared/schemas/battery.js';
import type { Programme } from '../../shared/schemas/programme.js';
import type { CommandLogRow, ProgrammeControlAction } from '../../shared/schemas/programme-run.js';
import { LIVE_RUN_STATES, type Run } from '../../shared/schemas/run.js';
import type { AppContext } from '../app-context.js';
import type { BenchInstrumentsProvider } from '../control/bench-instruments.js';
import { ProgrammeExecutor } from '../control/programme-executor.js';
import { DEFAULT_OVER_TEMP_CELSIUS, METER_SILENT_MS, type SafetyLimits } from '../control/safety-net.js';
import { reasonOf, rolesNeeded } from '../control/step-actions.js';
import { systemClock, type Clock } from '../ingest/clock.js';
import { ConflictError, InvalidInputError, notFound } from '../domain/domain-errors.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { recorderOf } from '../runs/runs-services.js';
import { ProgrammesRepo } from './programmes-repo.js';
import { RunProgrammesRepo } from './run-programmes-repo.js';
import { strandedFailEvent, switchOffStranded } from './stranded-programme.js';

declare module '../app-context.js' {
  interface AppServices {
    /** A bench's controllable instruments (set by the instrument drivers' attachment). */
    benchInstruments: BenchInstrumentsProvider;
    /** Runs test programmes on live runs (set by attachProgrammes). */
    programmeRunner: ProgrammeRunner;
  }
}

/** The command log is written to the database at most this often, ms. */
export const COMMAND_LOG_FLUSH_MS = 1000;

/** One programme running on one run. */
interface Active {
  benchId: number;
  executor: ProgrammeExecutor;
  commands: CommandLogRow[];
  stop(): void;
}

/**
 * Starts a saved programme on a live run and wires its executor to the world: the run's
 * readings in, step events onto the run's timeline, progress and the command log into the
 * database, and the run stopped when the programme ends (finished, or aborted when it failed).
 */
export class ProgrammeRunner {
  private readonly active = new Map<number, Active>();
  /** Runs whose programme is being set up (a double-clicked Start sends two requests). */
  private readonly starting = new Set<number>();
  private readonly programmes: ProgrammesRepo;
  private readonly runProgrammes: RunProgrammesRepo;
  private readonly runs: RunsRepo;

  constructor(private readonly ctx: AppContext, private readonly clock: Clock = systemClock) {
    this.programmes = new ProgrammesRepo(ctx.sequelize);
    this.runProgrammes = new RunProgrammesRepo(ctx.sequelize);
    this.runs = new RunsRepo(ctx.sequelize);
  }

  /**
   * Programmes that were running when the server stopped: many loads and supplies have no
   * watchdog of their own, so their outputs are switched off now (best effort, each read back),
   * the programme is marked failed, and a `fail` step event goes on the run's timeline through
   * the recorder, from which the alarm sink raises the critical programme-failed alarm. An
   * instrument that cannot be reached is named in the reason; nothing here throws out of start-up.
   */
  async failStranded(): Promise<void> {
    let unfinished: number[];
    try {
      unfinished = await this.runProgrammes.unfinished();
    } catch (error) {
      return this.ctx.log.error('Programmes stranded by the last stop could not be read', error);
    }
    for (const runId of unfinished) {
      if (this.active.has(runId)) continue;
      await this.failOneStranded(runId).catch((error) => this.ctx.log.error(`run ${runId}: stranded programme not failed cleanly`, error));
    }
  }

  private async failOneStranded(runId: number): Promise<void> {
    const run = await this.runs.get(runId);
    const stored = await this.runProgrammes.get(runId, this.clock.nowMs());
    const outcome = await switchOffStranded(this.ctx.services.benchInstruments, run?.benchId ?? null);
    this.ctx.log.warn(`run ${runId}: programme failed, ${outcome.reason}`);
    const recorder = this.ctx.services.runRecorder;
    // The event first: should the server stop again before the status is written, the next start
    // records it again (the alarm service raises no second open alarm) rather than never at all.
    if (recorder) {
      const atSeconds = recorder.session(runId)?.lastElapsedSeconds ?? run?.summary?.durationSeconds ?? 0;
      await recorder.addStoredEvent(runId, strandedFailEvent(stored, atSeconds, outcome), null);
    } else this.ctx.log.warn(`run ${runId}: live recording is not running here, so the failed programme raises no alarm`);
    await this.runProgrammes.fail(runId, outcome.reason);
  }

  /** Starts programme `programmeId` on live run `runId` (400 unsafe for the run's pack, 409 not possible now). */
  async start(runId: number, programmeId: number, user: { id: number; name: string }): Promise<void> {
    if (this.starting.has(runId)) throw new ConflictError(`A programme is already starting on run ${runId}`);
    this.starting.add(runId);
    try {
      await this.setUp(runId, programmeId, user);
    } finally {
      this.starting.delete(runId);
    }
  }

  private async setUp(runId: number, programmeId: number, user: { id: number; name: string }): Promise<void> {
    const run = await this.liveRun(runId);
    if (this.active.has(runId) || (await this.runProgrammes.get(runId, this.clock.nowMs()))) throw new ConflictError(`Run ${runId} already follows a programme`);
    const checked = await this.programmes.get(programmeId);
    if (!checked) throw notFound(`Programme ${programmeId}`);
    const pack = await this.packLimits(run, checked);
    const problems = programmeProblems(checked.steps, pack);
    if (problems.length > 0) throw new InvalidInputError(`Unsafe for this run's pack: ${problems.map((p) => p.message).join('; ')}`, Object.fromEntries(problems.map((p) => [p.path, [p.message]])));
    const plan = planSteps(checked.steps);
    const instruments = await this.instrumentsOf(run.benchId);
    const missing = [...rolesNeeded(plan.map((p) => p.step))].filter((role) => !instruments?.[role]);
    if (!instruments || missing.length > 0) throw new ConflictError(`Bench ${run.benchId} has no controllable ${missing.join(' or ') || 'instrument'} for this programme`);
    const limits: SafetyLimits = {
      floorVolts: safetyFloorVolts(pack), ceilingVolts: chargeCeilingVolts(pack), meterSilentMs: METER_SILENT_MS,
      overTempCelsius: Math.min(DEFAULT_OVER_TEMP_CELSIUS, run.alarms.highTempCelsius ?? Infinity),
    };
    const { id: _id, createdAt: _c, updatedAt: _u, description, ...body } = checked;
    await this.runProgrammes.create(runId, programmeId, { ...body, ...(description ? { description } : {}) }, limits.floorVolts, user.name);
    this.launch(runId, run.benchId, plan, instruments, limits, user.id);
  }

  private launch(runId: number, benchId: number, plan: ReturnType<typeof planSteps>, instruments: NonNullable<Awaited<ReturnType<BenchInstrumentsProvider['forBench']>>>, limits: SafetyLimits, userId: number): void {
    const recorder = recorderOf(this.ctx);
    const log = createLogger(`programme run ${runId}`, this.ctx.log);
    const commands: CommandLogRow[] = [];
    const executor: ProgrammeExecutor = new ProgrammeExecutor({
      plan, instruments, clock: this.clock, limits, log,
      onStepEvent: (event) => void recorder.addStoredEvent(runId, event, userId).catch((e) => log.error('step event not stored', e)),
      onChange: () => void this.runProgrammes.save(runId, executor.view()).catch((e) => log.error('progress not saved', e)),
      onCommand: (entry) => void commands.push(entry),
    });
    const offReadings = recorder.readings.add((id, reading) => id === runId && executor.onReading(reading));
    // A run stopped by hand (or by its own stop rule) takes its programme with it: outputs off.
    const offRuns = recorder.runChanges.add((run) => run.id === runId && !LIVE_RUN_STATES.includes(run.state) && executor.control('abort'));
    const flushTimer = setInterval(() => void this.flushCommands(runId, commands), COMMAND_LOG_FLUSH_MS);
    flushTimer.unref();
    const stop = () => {
      offReadings();
      offRuns();
      clearInterval(flushTimer);
    };
    this.active.set(runId, { benchId, executor, commands, stop });
    void executor.done.then(async (state) => {
      stop();
      this.active.delete(runId);
      await this.flushCommands(runId, commands);
      await this.runProgrammes.save(runId, executor.view());
      if (recorder.session(runId)) await recorder.stop(runId, state !== 'finished');
    }).catch((e) => log.error('did not end cleanly', e));
    void executor.start();
  }

  private async instrumentsOf(benchId: number) {
    try {
      return await this.ctx.services.benchInstruments?.forBench(benchId);
    } catch (error) {
      throw new ConflictError(`The instruments of bench ${benchId} cannot be opened: ${reasonOf(error)}`);
    }
  }

  /** True while a programme runs on a run of this bench (its instruments must not change under it). */
  busyOnBench(benchId: number): boolean {
    return [...this.active.values()].some((a) => a.benchId === benchId);
  }

  /** A technician's pause, resume, skip or abort on a run's programme (409 when none runs). */
  control(runId: number, action: ProgrammeControlAction): void {
    const active = this.active.get(runId);
    if (!active) throw new ConflictError(`Run ${runId} has no programme running`);
    active.executor.control(action);
  }

  /** A run's programme with its live state overlaid, or null. */
  async get(runId: number) {
    const stored = await this.runProgrammes.get(runId, this.clock.nowMs());
    const active = this.active.get(runId);
    if (!stored || !active) return stored;
    const view = active.executor.view();
    return { ...stored, ...view, roundTrips: active.executor.roundTrips() };
  }

  /** A run's command log page. */
  commands(runId: number, afterId: number, limit: number) {
    return this.runProgrammes.commands(runId, afterId, limit);
  }

  /** Aborts every running programme (outputs off) and writes what is pending; on server close. */
  async close(): Promise<void> {
    const all = [...this.active.values()];
    for (const a of all) a.executor.control('abort');
    await Promise.allSettled(all.map((a) => a.executor.done));
  }

  private async flushCommands(runId: number, commands: CommandLogRow[]): Promise<void> {
    const batch = commands.splice(0);
    try {
      await this.runProgrammes.appendCommands(runId, batch);
    } catch (error) {
      commands.unshift(...batch);
      this.ctx.log.warn(`run ${runId}: command log not written yet`, error);
    }
  }

  private async liveRun(runId: number): Promise<Run & { benchId: number }> {
    const run = await this.runs.get(runId);
    if (!run) throw notFound(`Run ${runId}`);
    if (run.origin !== 'live' || run.benchId === null || !LIVE_RUN_STATES.includes(run.state) || !recorderOf(this.ctx).session(runId))
      throw new ConflictError(`Run ${runId} is not recording live on a bench here`);
    return run as Run & { benchId: number };
  }

  /** The run's pack as the programme is checked against: its chemistry and cells, the lower of the two current ratings, its protection's cutoff. */
  private async packLimits(run: Run, programme: Programme): Promise<PackLimits> {
    const battery = run.batteryId ? await this.ctx.models.Battery.findByPk(run.batteryId) : null;
    if (!battery) return { chemistry: programme.chemistry, cellsInSeries: programme.cellsInSeries, maxCurrentAmps: programme.maxCurrentAmps };
    const lowVoltage = (battery.protectionSpecs ?? []).find((s) => s.protection === 'low-voltage');
    const chemistry = ChemistrySchema.safeParse(battery.chemistry);
    return {
      chemistry: chemistry.success ? chemistry.data : programme.chemistry,
      cellsInSeries: battery.cellsInSeries,
      maxCurrentAmps: Math.min(programme.maxCurrentAmps, battery.bmsRatedAmps ?? Infinity),
      protectionCutoffVolts: lowVoltage?.thresholdValue ?? null,
    };
  }
}
