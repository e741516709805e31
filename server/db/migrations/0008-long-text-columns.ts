// Text that the server derives from what people write can outgrow a TEXT column (64 KiB): a
// 20,000-character description in 4-byte characters, or the HTML of one full of '<' (each becomes
// '&lt;'); audit details may carry the before and after of such fields. MEDIUMTEXT holds 16 MiB.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

const COLUMNS = [
  ['part_revisions', 'description_md', false],
  ['part_revisions', 'description_html', false],
  ['audit_events', 'details', true],
] as const;

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const [table, column, allowNull] of COLUMNS) await q.changeColumn(table, column, { type: DataTypes.TEXT('medium'), allowNull });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const [table, column, allowNull] of COLUMNS) await q.changeColumn(table, column, { type: DataTypes.TEXT, allowNull });
};
