import type { BenchInstrumentsProvider } from '../control/bench-instruments.js';
import { InstrumentFault, type InstrumentControl } from '../control/instrument-control.js';
import type { InstrumentDriverInput } from '../../shared/schemas/instrument-driver.js';
import { openInstrument } from '../control/open-instrument.js';
import { reasonOf, type BenchInstruments } from '../control/step-actions.js';
import type { BenchInstrumentsRepo } from './bench-instruments-repo.js';

/**
 * Opens a bench's load and supply from their stored driver settings the first time a programme
 * asks, and keeps them open for the next one; a change of settings closes them.
 */
export class StoredBenchInstruments implements BenchInstrumentsProvider {
  private readonly open = new Map<number, Promise<BenchInstruments>>();

  constructor(private readonly repo: BenchInstrumentsRepo) {}

  /** The bench's instruments, opened (null when it has none). */
  async forBench(benchId: number): Promise<BenchInstruments | null> {
    let opening = this.open.get(benchId);
    if (!opening) {
      opening = this.openAll(benchId);
      this.open.set(benchId, opening);
      // A port that failed to open is tried again next time.
      opening.catch(() => this.open.delete(benchId));
    }
    const instruments = await opening;
    return instruments.load || instruments.supply ? instruments : null;
  }

  /**
   * Each of the bench's instruments opened on its own, so one that is missing does not keep the
   * other from being switched off. When all open they are kept as forBench keeps them; when one
   * is missing the caller must `forget` the bench afterwards, so the next programme opens both again.
   */
  async forBenchEach(benchId: number): Promise<{ instruments: BenchInstruments; unreachable: Array<{ id: string; problem: string }> }> {
    const cached = this.open.get(benchId);
    if (cached) {
      const instruments = await cached.catch(() => null);
      if (instruments) return { instruments, unreachable: [] };
    }
    const config = await this.repo.get(benchId);
    const unreachable: Array<{ id: string; problem: string }> = [];
    const openOne = async (driver: InstrumentDriverInput | null | undefined) => {
      if (!driver) return undefined;
      try {
        return await openInstrument(driver);
      } catch (error) {
        unreachable.push({ id: driver.id, problem: error instanceof InstrumentFault ? error.reason : reasonOf(error) });
        return undefined;
      }
    };
    const instruments: BenchInstruments = { load: await openOne(config.load), supply: await openOne(config.supply) };
    this.open.set(benchId, Promise.resolve(instruments));
    return { instruments, unreachable };
  }

  /** Closes a bench's instruments (its settings changed). */
  async forget(benchId: number): Promise<void> {
    const opening = this.open.get(benchId);
    this.open.delete(benchId);
    const instruments = await opening?.catch(() => null);
    await Promise.allSettled([instruments?.load?.close(), instruments?.supply?.close()]);
  }

  /** Closes every open instrument (server close). */
  async close(): Promise<void> {
    await Promise.all([...this.open.keys()].map((id) => this.forget(id)));
  }

  private async openAll(benchId: number): Promise<BenchInstruments> {
    const config = await this.repo.get(benchId);
    const opened: InstrumentControl[] = [];
    try {
      const load = config.load ? await openInstrument(config.load) : undefined;
      if (load) opened.push(load);
      const supply = config.supply ? await openInstrument(config.supply) : undefined;
      return { load, supply };
    } catch (error) {
      await Promise.allSettled(opened.map((i) => i.close()));
      throw error;
    }
  }
}
