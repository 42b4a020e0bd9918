import type { BenchStatus, SimulatorSourceConfig } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { createSimulation, loadScenario, startSimulatedInstruments, type SimReading, type Simulation, type SimulatedInstruments } from '../../../simulator/index.js';
import { systemClock, type Clock } from '../clock.js';
import { frameRejection } from '../frame-limits.js';
import { StatusTracker } from '../status-tracker.js';
import { safeDeliver, type Source, type SourceSink } from './source.js';
import { MS_PER_S } from '../../../shared/units/time.js';

type Player = ReturnType<Simulation['play']>;

/** How a simulator source's status begins when it (re)starts its simulated instruments: their links are new, so whoever held them open must reopen them. */
export const SIMULATED_INSTRUMENTS_STARTING = 'starting the simulated load and supply';

/**
 * A simulator scenario played in-process at the bench's speed: frames carry the
 * simulated device clock (t from 0 at start). Samples the simulated meter loses (drops,
 * unplugs) never arrive, so the watchdog sees them as a real meter's silence; corrupted
 * ones are counted as rejections, as garbled bytes would be. With `instruments`, the simulated
 * load and supply answer SCPI on their pseudo-terminals first and drive the pack while it rests.
 */
export class SimulatorSource implements Source {
  private readonly tracker: StatusTracker;
  private player: Player | undefined;
  private instruments: SimulatedInstruments | undefined;
  private running = false;
  /** Counts starts, so instruments that come up after a stop (or a later start) are stopped, not used. */
  private generation = 0;

  constructor(
    private readonly config: SimulatorSourceConfig,
    private readonly sink: SourceSink,
    private readonly clock: Clock = systemClock,
  ) {
    this.tracker = new StatusTracker(clock, config.staleAfterSeconds * MS_PER_S, (s) => safeDeliver(sink.status, s));
  }

  /** Loads the scenario and starts playing it (after its instruments, if any); an unknown scenario becomes an error status. */
  start(): void {
    if (this.running) return;
    this.running = true;
    if (!this.config.instruments) return this.play();
    const links = this.config.instruments;
    const generation = ++this.generation;
    this.tracker.connected(`${SIMULATED_INSTRUMENTS_STARTING} on ${links.loadLinkPath} and ${links.supplyLinkPath}`);
    startSimulatedInstruments(links, this.clock).then(
      async (instruments) => {
        // Stopped while socat was starting: nothing may stay behind.
        if (!this.running || generation !== this.generation) return void (await instruments.stop());
        this.instruments = instruments;
        this.play();
      },
      (err: unknown) => {
        if (generation !== this.generation) return;
        this.running = false;
        this.tracker.error(`simulated instruments: ${err instanceof Error ? err.message : String(err)}`);
      },
    );
  }

  private play(): void {
    try {
      const simulation = createSimulation(loadScenario(this.config.scenario), {
        seed: this.config.seed,
        speed: this.config.speed,
        clock: this.clock,
        drive: this.instruments?.drive,
      });
      this.tracker.connected(`simulating ${this.config.scenario} at ${this.config.speed}×`);
      const player = simulation.play((reading) => this.onReading(reading));
      this.player = player;
      void player.finished.then(() => {
        if (this.running && this.player === player) this.tracker.idle(`scenario ${this.config.scenario} finished`);
      });
    } catch (err) {
      this.running = false;
      this.tracker.error(err instanceof Error ? err.message : String(err));
    }
  }

  /** Stops the player; no frame is delivered afterwards. */
  async stop(): Promise<void> {
    this.running = false;
    this.generation += 1;
    const player = this.player;
    this.player = undefined;
    player?.stop();
    const instruments = this.instruments;
    this.instruments = undefined;
    await instruments?.stop();
    if (this.tracker.snapshot().state !== 'error') this.tracker.idle();
  }

  /** Current status with counts. */
  getStatus(): BenchStatus {
    return this.tracker.snapshot();
  }

  private onReading(reading: SimReading): void {
    if (!this.running || reading.lost) return;
    if (reading.corrupt) {
      this.tracker.rejected(`frame ${reading.seq} corrupted on the (simulated) wire`);
      return;
    }
    const frame: Frame = { ...reading.frame, clock: 'device' };
    const outside = frameRejection(frame, this.config.limits);
    if (outside) return this.tracker.rejected(outside);
    this.tracker.frameOk();
    safeDeliver(this.sink.frame, frame);
  }
}
