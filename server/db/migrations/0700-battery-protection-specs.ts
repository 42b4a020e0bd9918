import type { Migration } from '../migrate.js';

/** A pack's stated protections (JSON array of ProtectionSpec): what its protection checks are judged against. */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE batteries ADD COLUMN protectionSpecs TEXT NULL');
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE batteries DROP COLUMN protectionSpecs');
};
