import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('users', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    display_name: { type: DataTypes.STRING(80), allowNull: false },
    password_hash: { type: DataTypes.STRING(255), allowNull: false },
    role: { type: DataTypes.ENUM('member', 'moderator', 'admin'), allowNull: false, defaultValue: 'member' },
    status: { type: DataTypes.ENUM('active', 'suspended'), allowNull: false, defaultValue: 'active' },
    crew_role: { type: DataTypes.STRING(80), allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.createTable('sessions', {
    sid: { type: DataTypes.STRING(64), primaryKey: true },
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    expires: { type: DataTypes.DATE, allowNull: true },
    data: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('sessions', ['expires']);
  await q.addIndex('sessions', ['user_id']);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.dropTable('sessions');
  await q.dropTable('users');
};
