// Print requests between crew members (with every step on record), what the payments service told us
// (one row per webhook event, so a replay changes nothing), the owner's machine-hour rate, and a kit's
// purchase-order number and fee lines for its statement.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';
import { id, ref, timestamps } from '../migration-columns';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('print_requests', {
    id,
    requester_id: ref('users'),
    owner_id: ref('users'),
    printer_id: ref('printers', 'SET NULL', true),
    printer_name: { type: DataTypes.STRING(80), allowNull: false },
    printer_watts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    crew_id: ref('crews', 'SET NULL', true),
    kind: { type: DataTypes.ENUM('part', 'kit'), allowNull: false },
    part_id: ref('parts', 'SET NULL', true),
    recipe_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    kit_id: ref('kits', 'SET NULL', true),
    title: { type: DataTypes.STRING(200), allowNull: false },
    quantity: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    material: { type: DataTypes.STRING(20), allowNull: false },
    needed_by: { type: DataTypes.DATEONLY, allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: true },
    filament: { type: DataTypes.TEXT, allowNull: false },
    grams: { type: DataTypes.DECIMAL(10, 1), allowNull: false },
    minutes: { type: DataTypes.DECIMAL(10, 1), allowNull: false },
    estimate_notes: { type: DataTypes.TEXT, allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    status: {
      type: DataTypes.ENUM('requested', 'accepted', 'declined', 'cancelled', 'fit_tested', 'printed', 'handed_over'),
      allowNull: false,
      defaultValue: 'requested',
    },
    price_minor: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    frozen_price: { type: DataTypes.TEXT, allowNull: true },
    priced_at: { type: DataTypes.DATE, allowNull: true },
    payment_status: { type: DataTypes.ENUM('unpaid', 'pending', 'paid', 'refund_due', 'refunded'), allowNull: false, defaultValue: 'unpaid' },
    paid_minor: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    checkout_id: { type: DataTypes.STRING(120), allowNull: true },
    payment_ref: { type: DataTypes.STRING(120), allowNull: true },
    paid_at: { type: DataTypes.DATE, allowNull: true },
    refund_ref: { type: DataTypes.STRING(120), allowNull: true },
    refunded_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('print_requests', ['owner_id', 'status']);
  await q.addIndex('print_requests', ['requester_id', 'status']);
  await q.addIndex('print_requests', ['checkout_id']);

  await q.createTable('print_request_events', {
    id,
    request_id: ref('print_requests'),
    actor_id: ref('users', 'SET NULL', true),
    action: { type: DataTypes.STRING(30), allowNull: false },
    from_status: { type: DataTypes.STRING(20), allowNull: true },
    to_status: { type: DataTypes.STRING(20), allowNull: true },
    details: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('print_request_events', ['request_id', 'id']);

  await q.createTable('payment_events', {
    event_id: { type: DataTypes.STRING(120), primaryKey: true },
    type: { type: DataTypes.STRING(80), allowNull: false },
    request_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    outcome: { type: DataTypes.STRING(60), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });

  await q.addColumn('price_sheets', 'machine_hour_rate', { type: DataTypes.DECIMAL(10, 4), allowNull: true });
  await q.addColumn('kits', 'purchase_order', { type: DataTypes.STRING(60), allowNull: true });
  await q.addColumn('kits', 'statement_fees', { type: DataTypes.TEXT, allowNull: true });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.removeColumn('kits', 'statement_fees');
  await q.removeColumn('kits', 'purchase_order');
  await q.removeColumn('price_sheets', 'machine_hour_rate');
  for (const table of ['payment_events', 'print_request_events', 'print_requests']) await q.dropTable(table);
};
