// How many times the worker has tried to clean a photo, so one that keeps failing (or that took the
// process down) is marked failed for good instead of being resumed at every start.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

const attempts = { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 };

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.addColumn('part_files', 'processing_attempts', attempts);
  await q.addColumn('report_photos', 'processing_attempts', attempts);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.removeColumn('report_photos', 'processing_attempts');
  await q.removeColumn('part_files', 'processing_attempts');
};
