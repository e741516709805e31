// What several app instances on one database share: who holds each background job and until when
// (claimed_by, lease_until; lease_expiries counts the holders that went away mid-job), named leases
// for work one instance does at a time, the shelf's change log that every instance's search polls,
// and the rate-limit counters.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

const PHOTO_TABLES = ['part_files', 'report_photos', 'wanted_photos'];
const claimedBy = { type: DataTypes.STRING(100), allowNull: true };
const leaseUntil = { type: DataTypes.DATE(3), allowNull: true };
const expiries = { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 };

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const table of PHOTO_TABLES) {
    await q.addColumn(table, 'claimed_by', claimedBy);
    await q.addColumn(table, 'lease_until', leaseUntil);
    await q.addColumn(table, 'lease_expiries', expiries);
    await q.addIndex(table, ['processing', 'lease_until'], { name: `${table}_processing_lease` });
  }
  await q.addIndex('part_files', ['render_status', 'lease_until'], { name: 'part_files_render_lease' });
  await q.addColumn('mail_outbox', 'claimed_by', claimedBy);

  await q.createTable('job_leases', {
    name: { type: DataTypes.STRING(128), primaryKey: true },
    holder: { type: DataTypes.STRING(100), allowNull: true },
    lease_until: { type: DataTypes.DATE(3), allowNull: true },
    runs: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
  });
  await q.createTable('shelf_changes', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    kind: { type: DataTypes.ENUM('index', 'ranking'), allowNull: false },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('shelf_changes', ['kind', 'id']);
  await q.createTable('rate_limits', {
    rate_key: { type: DataTypes.STRING(191), primaryKey: true },
    hits: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    reset_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('rate_limits', ['reset_at']);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.dropTable('rate_limits');
  await q.dropTable('shelf_changes');
  await q.dropTable('job_leases');
  await q.removeColumn('mail_outbox', 'claimed_by');
  await q.removeIndex('part_files', 'part_files_render_lease');
  for (const table of [...PHOTO_TABLES].reverse()) {
    await q.removeIndex(table, `${table}_processing_lease`);
    await q.removeColumn(table, 'lease_expiries');
    await q.removeColumn(table, 'lease_until');
    await q.removeColumn(table, 'claimed_by');
  }
};
