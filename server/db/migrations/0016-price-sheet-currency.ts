// A member's prices are in a currency they name (ISO 4217); null reads as the default.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.addColumn('price_sheets', 'currency', { type: DataTypes.CHAR(3), allowNull: true });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.removeColumn('price_sheets', 'currency');
};
