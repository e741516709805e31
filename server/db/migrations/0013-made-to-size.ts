// Parts made to size: a printer's calibration per material (from the fit-test gauge), the generator
// and its parameters on a revision submitted from the make pages, and kit items that are a made
// part (generator + parameters) rather than a part on the shelf.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('printer_calibrations', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    printer_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'printers', key: 'id' }, onDelete: 'CASCADE' },
    material: { type: DataTypes.STRING(20), allowNull: false },
    nominal_mm: { type: DataTypes.DECIMAL(7, 3), allowNull: false },
    hole_fit_mm: { type: DataTypes.DECIMAL(7, 3), allowNull: false },
    hole_correction_mm: { type: DataTypes.DECIMAL(6, 3), allowNull: false },
    outer_fit_mm: { type: DataTypes.DECIMAL(7, 3), allowNull: true },
    outer_correction_mm: { type: DataTypes.DECIMAL(6, 3), allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('printer_calibrations', ['printer_id', 'material'], { unique: true });

  await q.addColumn('part_revisions', 'make_kind', { type: DataTypes.STRING(40), allowNull: true });
  await q.addColumn('part_revisions', 'make_params', { type: DataTypes.TEXT, allowNull: true });

  await q.sequelize.query('ALTER TABLE kit_items MODIFY part_id INT UNSIGNED NULL');
  await q.addColumn('kit_items', 'make_kind', { type: DataTypes.STRING(40), allowNull: true });
  await q.addColumn('kit_items', 'make_params', { type: DataTypes.TEXT, allowNull: true });
  // volume, area and size of the made mesh, measured when it was added (the kit plans from them)
  await q.addColumn('kit_items', 'make_geometry', { type: DataTypes.TEXT, allowNull: true });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.sequelize.query('DELETE FROM kit_items WHERE part_id IS NULL');
  for (const column of ['make_geometry', 'make_params', 'make_kind']) await q.removeColumn('kit_items', column);
  await q.sequelize.query('ALTER TABLE kit_items MODIFY part_id INT UNSIGNED NOT NULL');
  await q.removeColumn('part_revisions', 'make_params');
  await q.removeColumn('part_revisions', 'make_kind');
  await q.dropTable('printer_calibrations');
};
