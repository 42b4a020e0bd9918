import type { Migration } from '../migrate.js';

/** What an opening of a share link read: the report page (`page`) or its PDF (`pdf`). Rows before this were pages. */
export const up: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query("ALTER TABLE share_link_openings ADD COLUMN what VARCHAR(8) NOT NULL DEFAULT 'page'");
};

export const down: Migration = async ({ context: { sequelize } }) => {
  await sequelize.query('ALTER TABLE share_link_openings DROP COLUMN what');
};
