// Text that the server derives from what people write can outgrow a TEXT column (64 KiB): the HTML
// of a 20,000-character description full of '<' (each becomes '&lt;'), and audit details that carry
// the before and after of such fields. The Markdown source goes along: 20,000 three-byte characters
// already take 60,000 of TEXT's 65,535 bytes. MEDIUMTEXT holds 16 MiB.
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
