import { DataTypes, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** The single row (id 1) of `lab_settings`; `data` is the JSON document checked by LabSettingsSchema. */
export interface LabSettingsRow extends Model<InferAttributes<LabSettingsRow>, InferCreationAttributes<LabSettingsRow>> {
  id: number;
  data: string;
  updatedById: number | null;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}
export type LabSettingsModel = ModelStatic<LabSettingsRow>;

/** The id of the only settings row: one lab per installation. */
export const LAB_SETTINGS_ROW_ID = 1;

/** Defines the LabSettings model (table from migration 0001). */
export function defineLabSettings(sequelize: Sequelize): LabSettingsModel {
  return sequelize.define<LabSettingsRow>(
    'LabSettings',
    {
      id: { type: DataTypes.INTEGER, primaryKey: true },
      data: { type: DataTypes.TEXT, allowNull: false },
      updatedById: { type: DataTypes.INTEGER, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { tableName: 'lab_settings' },
  );
}
