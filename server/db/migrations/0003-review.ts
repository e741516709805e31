import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('audit_events', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    part_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'parts', key: 'id' }, onDelete: 'CASCADE' },
    revision_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    actor_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    action: { type: DataTypes.STRING(30), allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: true },
    details: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('audit_events', ['part_id', 'created_at']);

  await q.createTable('notices', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(30), allowNull: false },
    title: { type: DataTypes.STRING(200), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    link: { type: DataTypes.STRING(300), allowNull: true },
    read_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('notices', ['user_id', 'read_at']);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.dropTable('notices');
  await q.dropTable('audit_events');
};
