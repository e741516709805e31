// Which notices a member wants (bell and mail, per kind), the recall banners kits show until their owner
// acknowledges them, and the keys that let a set report or rating written offline be sent twice and
// filed once.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';
import { id, ref } from '../migration-columns';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('notice_preferences', {
    user_id: { ...ref('users'), primaryKey: true },
    kind: { type: DataTypes.STRING(30), allowNull: false, primaryKey: true },
    bell: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    mail: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });

  await q.createTable('kit_recalls', {
    id,
    kit_id: ref('kits'),
    part_id: ref('parts'),
    kind: { type: DataTypes.ENUM('retired', 'cautions', 'reports'), allowNull: false },
    part_title: { type: DataTypes.STRING(200), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    acknowledged_at: { type: DataTypes.DATE, allowNull: true },
    acknowledged_by: ref('users', 'SET NULL', true),
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('kit_recalls', ['kit_id', 'acknowledged_at']);

  await q.createTable('client_keys', {
    id,
    user_id: ref('users'),
    client_key: { type: DataTypes.STRING(64), allowNull: false },
    scope: { type: DataTypes.STRING(60), allowNull: false },
    result: { type: DataTypes.TEXT, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('client_keys', ['user_id', 'client_key'], { unique: true });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const table of ['client_keys', 'kit_recalls', 'notice_preferences']) await q.dropTable(table);
};
