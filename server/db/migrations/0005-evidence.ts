import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';
import { id, ref, timestamps } from '../migration-columns';

const hiding = {
  hidden_at: { type: DataTypes.DATE, allowNull: true },
  hidden_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
  hidden_reason: { type: DataTypes.TEXT, allowNull: true },
};

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('ratings', {
    id,
    part_id: ref('parts'),
    user_id: ref('users'),
    stars: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
    comment: { type: DataTypes.TEXT, allowNull: true },
    ...hiding,
    ...timestamps,
  });
  await q.addIndex('ratings', ['part_id', 'user_id'], { unique: true });

  await q.createTable('set_reports', {
    id,
    part_id: ref('parts'),
    user_id: ref('users'),
    production: { type: DataTypes.STRING(120), allowNull: false },
    days_in_use: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    conditions: { type: DataTypes.TEXT, allowNull: false },
    recipe_id: ref('recipes', 'SET NULL', true),
    material: { type: DataTypes.STRING(20), allowNull: false },
    infill_pct: { type: DataTypes.DECIMAL(5, 2), allowNull: true },
    walls: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    outcome: { type: DataTypes.ENUM('held-up', 'worn-but-working', 'deformed', 'cracked', 'failed'), allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...hiding,
    ...timestamps,
  });
  await q.addIndex('set_reports', ['part_id', 'created_at']);

  await q.createTable('report_photos', {
    id,
    report_id: ref('set_reports'),
    stored_name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
    original_name: { type: DataTypes.STRING(200), allowNull: false },
    size_bytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    processing: { type: DataTypes.ENUM('ready', 'pending', 'failed'), allowNull: false, defaultValue: 'pending' },
    width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    ...timestamps,
  });

  await q.createTable('content_flags', {
    id,
    target_type: { type: DataTypes.ENUM('rating', 'report'), allowNull: false },
    target_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    user_id: ref('users'),
    reason: { type: DataTypes.TEXT, allowNull: false },
    resolved_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('content_flags', ['target_type', 'target_id', 'user_id'], { unique: true });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const table of ['content_flags', 'report_photos', 'set_reports', 'ratings']) await q.dropTable(table);
};
