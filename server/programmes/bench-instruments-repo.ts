import { QueryTypes, type Sequelize } from 'sequelize';
import { BenchInstrumentsSchema, type BenchInstrumentsConfig } from '../../shared/schemas/bench-instruments.js';
import { utcDateTime } from '../db/utc-datetime.js';

/** Driver settings of each bench's load and supply. */
export class BenchInstrumentsRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** A bench's instruments (both null when it has none). */
  async get(benchId: number): Promise<BenchInstrumentsConfig> {
    const rows = await this.sequelize.query<{ role: string; driver: string | object }>('SELECT role, driver FROM bench_instruments WHERE benchId = ?', {
      replacements: [benchId],
      type: QueryTypes.SELECT,
    });
    const raw: Record<string, unknown> = {};
    for (const row of rows) raw[row.role] = typeof row.driver === 'string' ? JSON.parse(row.driver) : row.driver;
    return BenchInstrumentsSchema.parse(raw);
  }

  /** Replaces a bench's instruments in one transaction. */
  async put(benchId: number, config: BenchInstrumentsConfig): Promise<void> {
    await this.sequelize.transaction(async (transaction) => {
      await this.sequelize.query('DELETE FROM bench_instruments WHERE benchId = ?', { replacements: [benchId], transaction });
      for (const role of ['load', 'supply'] as const) {
        const driver = config[role];
        if (driver)
          await this.sequelize.query('INSERT INTO bench_instruments (benchId, role, driver, updatedAt) VALUES (?, ?, ?, ?)', {
            replacements: [benchId, role, JSON.stringify(driver), utcDateTime(new Date())],
            transaction,
          });
      }
    });
  }
}
