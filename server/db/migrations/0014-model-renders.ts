// Every model gets a shaded preview picture (server/modules/files/render-model.ts), stored beside it as
// display and thumbnail JPEGs. The state and the tries are counted like a photo's cleaning. Models
// already on the shelf are marked waiting, so the start-up recovery draws them (the backfill).
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.addColumn('part_files', 'render_status', { type: DataTypes.ENUM('pending', 'ready', 'failed'), allowNull: true, defaultValue: null });
  await q.addColumn('part_files', 'render_attempts', { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 });
  await q.sequelize.query("UPDATE part_files SET render_status = 'pending' WHERE kind = 'model'");
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.removeColumn('part_files', 'render_attempts');
  await q.removeColumn('part_files', 'render_status');
};
