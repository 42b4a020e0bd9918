import { DataTypes, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { Battery, Chemistry } from '../../../shared/schemas/battery.js';
import { ProtectionSpecSchema, type ProtectionSpec } from '../../../shared/schemas/protection-check.js';

/** A row of `batteries`: one pack or cell under test. */
export interface BatteryRow extends Model<InferAttributes<BatteryRow>, InferCreationAttributes<BatteryRow>> {
  id: CreationOptional<number>;
  label: string;
  brand: string;
  model: string | null;
  chemistry: Chemistry;
  cellsInSeries: number;
  cellsInParallel: number;
  ratedAh: number;
  ratedWh: number | null;
  bmsRatedAmps: number | null;
  massKg: number | null;
  price: number | null;
  priceCurrency: string | null;
  serialNumber: string | null;
  sender: string | null;
  notes: string | null;
  receivedOn: string | null;
  owner: string | null;
  lengthMm: number | null;
  widthMm: number | null;
  heightMm: number | null;
  terminalType: string | null;
  statedCycleLife: number | null;
  warrantyMonths: number | null;
  /** JSON array of ProtectionSpec (migration 0700); null = none stated. */
  protectionSpecs: ProtectionSpec[] | null;
  createdById: number | null;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}
export type BatteryModel = ModelStatic<BatteryRow>;

/** Optional fields left out of a new battery are stored as null, matching the API shape. */
export const BATTERY_OPTIONAL_DEFAULTS = {
  model: null, ratedWh: null, bmsRatedAmps: null, massKg: null, price: null,
  priceCurrency: null, serialNumber: null, sender: null, notes: null,
  receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null,
  terminalType: null, statedCycleLife: null, warrantyMonths: null, protectionSpecs: null,
};

/** Reads the stored protection specs, dropping anything that no longer parses (a bad row never breaks the pack's page). */
export function parseProtectionSpecs(raw: unknown): ProtectionSpec[] {
  if (raw === null || raw === undefined) return [];
  let value: unknown = raw;
  if (typeof raw === 'string') {
    try {
      value = JSON.parse(raw);
    } catch {
      return [];
    }
  }
  const parsed = ProtectionSpecSchema.array().safeParse(value);
  return parsed.success ? parsed.data : [];
}

const nullable = (type: DataTypes.DataType) => ({ type, allowNull: true, defaultValue: null });

/** Defines the Battery model (table from migration 0001, register fields from 1000). */
export function defineBattery(sequelize: Sequelize): BatteryModel {
  return sequelize.define<BatteryRow>(
    'Battery',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      label: { type: DataTypes.STRING(120), allowNull: false },
      brand: { type: DataTypes.STRING(120), allowNull: false },
      model: nullable(DataTypes.STRING(120)),
      chemistry: { type: DataTypes.STRING(16), allowNull: false },
      cellsInSeries: { type: DataTypes.INTEGER, allowNull: false },
      cellsInParallel: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      ratedAh: { type: DataTypes.DOUBLE, allowNull: false },
      ratedWh: nullable(DataTypes.DOUBLE),
      bmsRatedAmps: nullable(DataTypes.DOUBLE),
      massKg: nullable(DataTypes.DOUBLE),
      price: nullable(DataTypes.DOUBLE),
      priceCurrency: nullable(DataTypes.STRING(3)),
      serialNumber: nullable(DataTypes.STRING(120)),
      sender: nullable(DataTypes.STRING(200)),
      notes: nullable(DataTypes.TEXT),
      receivedOn: nullable(DataTypes.DATEONLY),
      owner: nullable(DataTypes.STRING(200)),
      lengthMm: nullable(DataTypes.DOUBLE),
      widthMm: nullable(DataTypes.DOUBLE),
      heightMm: nullable(DataTypes.DOUBLE),
      terminalType: nullable(DataTypes.STRING(120)),
      statedCycleLife: nullable(DataTypes.INTEGER),
      warrantyMonths: nullable(DataTypes.INTEGER),
      protectionSpecs: {
        type: DataTypes.TEXT,
        allowNull: true,
        defaultValue: null,
        get(this: BatteryRow) {
          return parseProtectionSpecs(this.getDataValue('protectionSpecs'));
        },
        set(this: BatteryRow, value: ProtectionSpec[] | null) {
          this.setDataValue('protectionSpecs', (value && value.length > 0 ? JSON.stringify(value) : null) as unknown as ProtectionSpec[]);
        },
      },
      createdById: nullable(DataTypes.INTEGER),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { tableName: 'batteries' },
  );
}

/** The battery as the API returns it. */
export function toApiBattery(row: BatteryRow): Battery {
  const { createdById: _createdBy, createdAt, updatedAt, ...fields } = row.get({ plain: true });
  return { ...fields, protectionSpecs: parseProtectionSpecs(fields.protectionSpecs), createdAt: new Date(createdAt).toISOString(), updatedAt: new Date(updatedAt).toISOString() };
}
