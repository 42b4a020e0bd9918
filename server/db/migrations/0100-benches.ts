import { DataTypes } from 'sequelize';
import type { Migration } from '../migrate.js';

/** Benches: a name, the source configuration (JSON checked by BenchSourceConfigSchema), enabled, notes. */
export const up: Migration = async ({ context: { queryInterface: qi } }) => {
  await qi.createTable('benches', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
    source: { type: DataTypes.TEXT, allowNull: false },
    enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    notes: { type: DataTypes.TEXT, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
};

/** Drops the benches table. */
export const down: Migration = async ({ context: { queryInterface: qi } }) => {
  await qi.dropTable('benches');
};
