import { DataTypes } from 'sequelize';
import type { Migration } from '../migrate.js';

const timestamps = {
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
};

/** Users, sessions (connect-session-sequelize's columns), battery packs and lab settings. */
export const up: Migration = async ({ context: { queryInterface: qi } }) => {
  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM('viewer', 'technician', 'admin'), allowNull: false },
    passwordHash: { type: DataTypes.STRING(255), allowNull: false },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await qi.createTable('sessions', {
    sid: { type: DataTypes.STRING(36), primaryKey: true },
    expires: { type: DataTypes.DATE, allowNull: true },
    data: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
  await qi.addIndex('sessions', ['expires']);
  await qi.createTable('batteries', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    label: { type: DataTypes.STRING(120), allowNull: false },
    brand: { type: DataTypes.STRING(120), allowNull: false },
    model: { type: DataTypes.STRING(120), allowNull: true },
    chemistry: { type: DataTypes.STRING(16), allowNull: false },
    cellsInSeries: { type: DataTypes.INTEGER, allowNull: false },
    cellsInParallel: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    ratedAh: { type: DataTypes.DOUBLE, allowNull: false },
    ratedWh: { type: DataTypes.DOUBLE, allowNull: true },
    bmsRatedAmps: { type: DataTypes.DOUBLE, allowNull: true },
    massKg: { type: DataTypes.DOUBLE, allowNull: true },
    price: { type: DataTypes.DOUBLE, allowNull: true },
    priceCurrency: { type: DataTypes.STRING(3), allowNull: true },
    serialNumber: { type: DataTypes.STRING(120), allowNull: true },
    sender: { type: DataTypes.STRING(200), allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    createdById: {
      type: DataTypes.INTEGER, allowNull: true,
      references: { model: 'users', key: 'id' }, onDelete: 'SET NULL', onUpdate: 'CASCADE',
    },
    ...timestamps,
  });
  await qi.createTable('lab_settings', {
    id: { type: DataTypes.INTEGER, primaryKey: true },
    data: { type: DataTypes.TEXT, allowNull: false },
    updatedById: {
      type: DataTypes.INTEGER, allowNull: true,
      references: { model: 'users', key: 'id' }, onDelete: 'SET NULL', onUpdate: 'CASCADE',
    },
    ...timestamps,
  });
};

/** Drops the tables in reverse order of their foreign keys. */
export const down: Migration = async ({ context: { queryInterface: qi } }) => {
  await qi.dropTable('lab_settings');
  await qi.dropTable('batteries');
  await qi.dropTable('sessions');
  await qi.dropTable('users');
};
