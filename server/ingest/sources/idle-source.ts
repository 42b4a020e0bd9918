import type { BenchStatus } from '../../../shared/schemas/bench.js';
import type { Source } from './source.js';

/** The source of a bench with none configured (or disabled): always idle, never a frame. */
export class IdleSource implements Source {
  constructor(private readonly message: string) {}

  /** Nothing to start. */
  start(): void {}

  /** Nothing to stop. */
  async stop(): Promise<void> {}

  /** Idle with the reason. */
  getStatus(): BenchStatus {
    return { state: 'idle', message: this.message, framesOk: 0, framesRejected: 0 };
  }
}
