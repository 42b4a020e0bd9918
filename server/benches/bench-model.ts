import { DataTypes, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import { BenchSourceConfigSchema, type Bench, type BenchSourceConfig } from '../../shared/schemas/bench.js';
import { readMeterAccuracy } from '../../shared/schemas/meter-accuracy.js';
import { withCurrentKeys } from '../../shared/schemas/legacy-keys.js';

/** A row of `benches`; `source` holds the JSON text of a BenchSourceConfig. */
export interface BenchRow extends Model<InferAttributes<BenchRow>, InferCreationAttributes<BenchRow>> {
  id: CreationOptional<number>;
  name: string;
  source: string;
  enabled: boolean;
  notes: string;
  /** Load threshold, A (migration 0600); null = the core's default. */
  loadOnAmps: CreationOptional<number | null>;
  /** JSON of the meter's stated accuracy (migration 1250); null = not stated. */
  meterAccuracy: CreationOptional<string | null>;
  /** The gateway that runs this bench's source (migration 1650); null = this server. */
  gatewayId: CreationOptional<number | null>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}
export type BenchModel = ModelStatic<BenchRow>;

const MODEL_NAME = 'Bench';

/** The Bench model on `sequelize`, defined on first use (table from migration 0100). */
export function benchModel(sequelize: Sequelize): BenchModel {
  if (sequelize.isDefined(MODEL_NAME)) return sequelize.model(MODEL_NAME) as BenchModel;
  return sequelize.define<BenchRow>(
    MODEL_NAME,
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
      source: { type: DataTypes.TEXT, allowNull: false },
      enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      notes: { type: DataTypes.TEXT, allowNull: false },
      loadOnAmps: { type: DataTypes.DOUBLE, allowNull: true, defaultValue: null },
      meterAccuracy: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
      gatewayId: { type: DataTypes.INTEGER, allowNull: true, defaultValue: null },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { tableName: 'benches' },
  );
}

/**
 * Reads the stored source configuration. A row written by an older version that no longer
 * validates becomes "none" with the reason, so one bad row never hides the others.
 */
export function readSource(row: BenchRow): { source: BenchSourceConfig; problem?: string } {
  try {
    // A row stored before the renames (`staleAfterS`) reads as the same source. // vocab-rename: keep
    const parsed = BenchSourceConfigSchema.safeParse(withCurrentKeys(JSON.parse(row.source)));
    if (parsed.success) return { source: parsed.data };
    return { source: { kind: 'none' }, problem: `stored source is invalid: ${parsed.error.issues[0]?.message ?? 'unknown'}` };
  } catch {
    return { source: { kind: 'none' }, problem: 'stored source is not valid JSON' };
  }
}

/** The API shape of a bench row (without live status). */
export function toApiBench(row: BenchRow): Bench {
  return {
    id: row.id,
    name: row.name,
    source: readSource(row).source,
    enabled: row.enabled,
    notes: row.notes,
    loadOnAmps: row.loadOnAmps ?? null,
    meterAccuracy: readMeterAccuracy(row.meterAccuracy),
    gatewayId: row.gatewayId ?? null,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}
