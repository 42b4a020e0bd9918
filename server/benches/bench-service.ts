import type { Sequelize } from 'sequelize';
import type { Bench, BenchStatus, BenchWithStatus, CreateBenchRequestSchema, UpdateBenchRequestSchema } from '../../shared/schemas/bench.js';
import type { z } from 'zod';
import type { BenchManager, ManagedBench } from '../ingest/bench-manager.js';
import { benchModel, readSource, toApiBench, type BenchRow } from './bench-model.js';

const NO_MANAGER: BenchStatus = { state: 'idle', message: 'bench manager not running', framesOk: 0, framesRejected: 0 };

/** A bench row as the manager wants it. */
export function toManaged(row: BenchRow): ManagedBench {
  return { id: row.id, source: readSource(row).source, enabled: row.enabled, gatewayId: row.gatewayId ?? null };
}

/** Every stored bench as the manager wants it, for its start. */
export async function storedBenches(sequelize: Sequelize): Promise<ManagedBench[]> {
  return (await benchModel(sequelize).findAll()).map(toManaged);
}

/** A bench with its live status (or why it has none). */
export function withStatus(row: BenchRow, manager: BenchManager | undefined): BenchWithStatus {
  const bench: Bench = toApiBench(row);
  const problem = readSource(row).problem;
  if (problem) return { ...bench, status: { state: 'error', message: problem, framesOk: 0, framesRejected: 0 } };
  return { ...bench, status: manager ? manager.getStatus(row.id) : NO_MANAGER };
}

/** Bench storage plus keeping the manager in step with every change. */
export function createBenchService(sequelize: Sequelize, manager: () => BenchManager | undefined) {
  const Bench = benchModel(sequelize);
  return {
    /** All benches by name. */
    list: () => Bench.findAll({ order: [['name', 'ASC']] }),
    /** One bench or null. */
    find: (id: number) => Bench.findByPk(id),
    /** Stores a new bench and starts its source. */
    async create(input: z.infer<typeof CreateBenchRequestSchema>): Promise<BenchRow> {
      const row = await Bench.create({ ...input, source: JSON.stringify(input.source), meterAccuracy: input.meterAccuracy ? JSON.stringify(input.meterAccuracy) : null });
      await manager()?.apply(toManaged(row));
      return row;
    },
    /** Changes a bench; the manager restarts its source only if the source or enabled flag changed. */
    async update(row: BenchRow, change: z.infer<typeof UpdateBenchRequestSchema>): Promise<BenchRow> {
      const { source, meterAccuracy, ...rest } = change;
      const accuracy = meterAccuracy === undefined ? {} : { meterAccuracy: meterAccuracy ? JSON.stringify(meterAccuracy) : null };
      await row.update({ ...rest, ...accuracy, ...(source && { source: JSON.stringify(source) }) });
      await manager()?.apply(toManaged(row));
      return row;
    },
    /** Stops the bench's source, then deletes it. */
    async remove(row: BenchRow): Promise<void> {
      await manager()?.remove(row.id);
      await row.destroy();
    },
  };
}
