// Prep days: a member's printers and filament prices, shoot kits with their items and who they are
// shared with.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';
import { id, ref, timestamps } from '../migration-columns';

const amount = { type: DataTypes.DECIMAL(10, 2), allowNull: true };

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('printers', {
    id,
    owner_id: ref('users'),
    name: { type: DataTypes.STRING(80), allowNull: false },
    bed_x_mm: { type: DataTypes.DECIMAL(6, 1), allowNull: false },
    bed_y_mm: { type: DataTypes.DECIMAL(6, 1), allowNull: false },
    bed_z_mm: { type: DataTypes.DECIMAL(6, 1), allowNull: false },
    nozzle_mm: { type: DataTypes.DECIMAL(4, 2), allowNull: false },
    watts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('printers', ['owner_id']);

  // one row per member; only the materials they priced themselves, the rest follow the defaults
  await q.createTable('price_sheets', {
    user_id: { ...ref('users'), primaryKey: true },
    prices_per_kg: { type: DataTypes.TEXT, allowNull: false },
    price_per_kwh: { type: DataTypes.DECIMAL(8, 4), allowNull: true },
    ...timestamps,
  });

  await q.createTable('kits', {
    id,
    owner_id: ref('users'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    production: { type: DataTypes.STRING(120), allowNull: true },
    starts_on: { type: DataTypes.DATEONLY, allowNull: true },
    ends_on: { type: DataTypes.DATEONLY, allowNull: true },
    location_notes: { type: DataTypes.TEXT, allowNull: true },
    heat_exposure: { type: DataTypes.STRING(20), allowNull: true },
    print_hours_per_day: { type: DataTypes.DECIMAL(4, 1), allowNull: false, defaultValue: 8 },
    printer_price: amount,
    ...timestamps,
  });
  await q.addIndex('kits', ['owner_id']);

  await q.createTable('kit_shares', {
    id,
    kit_id: ref('kits'),
    user_id: ref('users'),
    access: { type: DataTypes.ENUM('read', 'edit'), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('kit_shares', ['kit_id', 'user_id'], { unique: true });
  await q.addIndex('kit_shares', ['user_id']);

  await q.createTable('kit_items', {
    id,
    kit_id: ref('kits'),
    part_id: ref('parts'),
    position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    quantity: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    recipe_id: ref('recipes', 'SET NULL', true),
    material: { type: DataTypes.STRING(20), allowNull: true },
    printer_id: ref('printers', 'SET NULL', true),
    bought_price_each: amount,
    service_price_each: amount,
    service_shipping: amount,
    ...timestamps,
  });
  await q.addIndex('kit_items', ['kit_id', 'position']);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const table of ['kit_items', 'kit_shares', 'kits', 'price_sheets', 'printers']) await q.dropTable(table);
};
