import type { BenchSourceConfig } from '../../../shared/schemas/bench.js';
import { systemClock, type Clock } from '../clock.js';
import { IdleSource } from './idle-source.js';
import { SerialSource, type SerialSourceDeps } from './serial-source.js';
import { SimulatorPtySource } from './simulator-pty-source.js';
import { SimulatorSource } from './simulator-source.js';
import type { Source, SourceSink } from './source.js';

/** Injected pieces shared by every source (tests pass a manual clock and the mock port factory). */
export interface SourceDeps extends SerialSourceDeps {
  clock?: Clock;
}

/** Builds the source a bench's configuration describes. */
export function createSource(config: BenchSourceConfig, sink: SourceSink, deps: SourceDeps = {}): Source {
  switch (config.kind) {
    case 'serial':
      return new SerialSource(config, sink, deps);
    case 'simulator':
      // With a format the simulator writes bytes into a pseudo-terminal; without, frames are handed over in-process.
      if (config.format) return new SimulatorPtySource({ ...config, format: config.format }, sink, deps);
      return new SimulatorSource(config, sink, deps.clock ?? systemClock);
    case 'none':
      return new IdleSource('no source configured');
  }
}
