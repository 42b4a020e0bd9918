import type { BenchInstruments } from './step-actions.js';

/**
 * Where a programme gets a bench's controllable instruments (the instrument drivers provide
 * it); null when the bench has none. The provider owns the instruments (their ports stay open
 * between programmes); a programme only sends commands.
 */
export interface BenchInstrumentsProvider {
  forBench(benchId: number): Promise<BenchInstruments | null>;
  /**
   * Each instrument opened on its own (to switch a bench off after a stop): those that open come
   * back, each that does not is named with its problem. Never rejects for an instrument.
   */
  forBenchEach?(benchId: number): Promise<{ instruments: BenchInstruments; unreachable: Array<{ id: string; problem: string }> }>;
  /** Closes what is open for a bench (its settings changed). */
  forget?(benchId: number): Promise<void>;
  /** Closes everything (server close). */
  close?(): Promise<void>;
}
