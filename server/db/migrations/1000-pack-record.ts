import { DataTypes } from 'sequelize';
import type { Migration } from '../migrate.js';

/** The checklist a lab starts with; frozen here so later edits to defaults never rewrite history. */
const DEFAULT_INSPECTION_ITEMS = [
  'Cell format and count',
  'Interconnects and welds',
  'Cell compression and fixing',
  'Protection board and its rating',
  'Wire gauge and terminations',
  'Temperature sensors and their placement',
  'Heater and its control',
  'Adhesive or potting',
  'Case and sealing',
  'Balance leads',
];

const timestamps = {
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
};
const userRef = {
  type: DataTypes.INTEGER, allowNull: true,
  references: { model: 'users', key: 'id' }, onDelete: 'SET NULL', onUpdate: 'CASCADE',
};

/**
 * The pack's record: register fields a lab keeps (received, owner, size, terminals, cycle life,
 * warranty), the lab's teardown checklist (seeded with the default items), each pack's ratings
 * against it, and the photos. A pack with photos or ratings is kept (RESTRICT): its files are
 * removed through the photo routes, never by a cascade that would leave them on disk.
 */
export const up: Migration = async ({ context: { queryInterface: qi, sequelize } }) => {
  await sequelize.query(`ALTER TABLE batteries
    ADD COLUMN receivedOn DATE NULL, ADD COLUMN owner VARCHAR(200) NULL,
    ADD COLUMN lengthMm DOUBLE NULL, ADD COLUMN widthMm DOUBLE NULL, ADD COLUMN heightMm DOUBLE NULL,
    ADD COLUMN terminalType VARCHAR(120) NULL, ADD COLUMN statedCycleLife INT NULL, ADD COLUMN warrantyMonths INT NULL`);
  await qi.createTable('inspection_items', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    title: { type: DataTypes.STRING(200), allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  const now = new Date();
  await qi.bulkInsert('inspection_items', DEFAULT_INSPECTION_ITEMS.map((title, index) => ({
    title, position: index + 1, archived: false, createdAt: now, updatedAt: now,
  })));
  await qi.createTable('battery_inspections', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    batteryId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'batteries', key: 'id' }, onDelete: 'RESTRICT', onUpdate: 'CASCADE' },
    itemId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'inspection_items', key: 'id' }, onDelete: 'RESTRICT', onUpdate: 'CASCADE' },
    rating: { type: DataTypes.ENUM('good', 'acceptable', 'concern'), allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: true },
    updatedById: userRef,
    ...timestamps,
  });
  await qi.addIndex('battery_inspections', ['batteryId', 'itemId'], { unique: true });
  await qi.createTable('battery_photos', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    batteryId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'batteries', key: 'id' }, onDelete: 'RESTRICT', onUpdate: 'CASCADE' },
    itemId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'inspection_items', key: 'id' }, onDelete: 'SET NULL', onUpdate: 'CASCADE' },
    storageKey: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    fileName: { type: DataTypes.STRING(200), allowNull: false },
    /** Format of the full-size copy (thumbnail and web copy are always JPEG). */
    format: { type: DataTypes.STRING(8), allowNull: false },
    widthPx: { type: DataTypes.INTEGER, allowNull: false },
    heightPx: { type: DataTypes.INTEGER, allowNull: false },
    bytes: { type: DataTypes.INTEGER, allowNull: false },
    createdById: userRef,
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('battery_photos', ['batteryId']);
};

/** Drops the record's tables and columns in reverse order. */
export const down: Migration = async ({ context: { queryInterface: qi, sequelize } }) => {
  await qi.dropTable('battery_photos');
  await qi.dropTable('battery_inspections');
  await qi.dropTable('inspection_items');
  await sequelize.query(`ALTER TABLE batteries DROP COLUMN receivedOn, DROP COLUMN owner, DROP COLUMN lengthMm,
    DROP COLUMN widthMm, DROP COLUMN heightMm, DROP COLUMN terminalType, DROP COLUMN statedCycleLife, DROP COLUMN warrantyMonths`);
};
