import type { BenchStatus, SimulatorSourceConfig } from '../../../shared/schemas/bench.js';
import { loadScenario, startPtyMeter, type PtyMeter } from '../../../simulator/index.js';
import { systemClock, type Clock } from '../clock.js';
import { StatusTracker } from '../status-tracker.js';
import { SerialSource, type SerialSourceDeps } from './serial-source.js';
import { serialFormatForSimulator } from './simulator-formats.js';
import { safeDeliver, type Source, type SourceSink } from './source.js';
import { MS_PER_S } from '../../../shared/units/time.js';

/** Pseudo-terminal links live under /tmp, never in the repository (Tailwind hangs scanning them). */
const LINK_DIR = '/tmp';
let linkCounter = 0;

/**
 * A simulator scenario played as a meter on a socat pseudo-terminal, read back through a
 * real SerialSource: the whole serial path (framing, parsing, polling, reconnects) runs
 * as with hardware on the bench.
 */
export class SimulatorPtySource implements Source {
  private readonly tracker: StatusTracker;
  private meter: PtyMeter | undefined;
  private serial: SerialSource | undefined;
  private running = false;

  constructor(
    private readonly config: SimulatorSourceConfig & { format: NonNullable<SimulatorSourceConfig['format']> },
    private readonly sink: SourceSink,
    private readonly deps: SerialSourceDeps & { clock?: Clock } = {},
  ) {
    this.tracker = new StatusTracker(deps.clock ?? systemClock, undefined, (s) => safeDeliver(sink.status, s));
  }

  /** Starts the meter on a new pseudo-terminal, then the serial source on its link. */
  start(): void {
    if (this.running) return;
    this.running = true;
    void this.begin();
  }

  /** Stops reading, then the meter (socat removes the link). */
  async stop(): Promise<void> {
    this.running = false;
    const { serial, meter } = this;
    this.serial = undefined;
    this.meter = undefined;
    await serial?.stop();
    await meter?.stop();
    if (this.tracker.snapshot().state !== 'error') this.tracker.idle();
  }

  /** The serial source's status once it runs; before that (or after a fault) our own. */
  getStatus(): BenchStatus {
    return this.serial?.getStatus() ?? this.tracker.snapshot();
  }

  private async begin(): Promise<void> {
    const clock = this.deps.clock ?? systemClock;
    try {
      const scenario = loadScenario(this.config.scenario);
      const linkPath = `${LINK_DIR}/kneepoint-sim-${process.pid}-${++linkCounter}`;
      this.tracker.connected(`starting ${this.config.scenario} on ${linkPath}`);
      const meter = await startPtyMeter({
        scenario,
        format: this.config.format,
        linkPath,
        speed: this.config.speed,
        seed: this.config.seed,
        clock,
      });
      if (!this.running) return void (await meter.stop());
      this.meter = meter;
      const format = serialFormatForSimulator(this.config.format, scenario, this.config.speed);
      const serial = new SerialSource(
        { kind: 'serial', path: linkPath, baudRate: 115200, dataBits: 8, parity: 'none', stopBits: 1, staleAfterSeconds: this.config.staleAfterSeconds, format, limits: this.config.limits },
        this.sink,
        this.deps,
      );
      this.serial = serial;
      serial.start();
      void meter.finished.then(async () => {
        if (this.serial !== serial) return;
        // Let the last bytes through before closing, then say why the stream ended.
        await new Promise((r) => clock.setTimeout(() => r(undefined), this.config.staleAfterSeconds * MS_PER_S));
        if (this.serial !== serial) return;
        this.serial = undefined;
        await serial.stop();
        this.tracker.idle(`scenario ${this.config.scenario} finished`);
      });
    } catch (err) {
      this.running = false;
      this.tracker.error(err instanceof Error ? err.message : String(err));
    }
  }
}
