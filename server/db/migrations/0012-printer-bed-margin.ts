// Printers keep a margin round the bed's edge for a brim or skirt; a part must fit inside it.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.addColumn('printers', 'bed_margin_mm', { type: DataTypes.DECIMAL(4, 1), allowNull: false, defaultValue: 5 });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.removeColumn('printers', 'bed_margin_mm');
};
