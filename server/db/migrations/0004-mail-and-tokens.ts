import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('mail_outbox', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    to_address: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(255), allowNull: false },
    text_body: { type: DataTypes.TEXT('medium'), allowNull: true },
    html_body: { type: DataTypes.TEXT('medium'), allowNull: true },
    status: { type: DataTypes.ENUM('queued', 'sent', 'failed'), allowNull: false, defaultValue: 'queued' },
    attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    last_error: { type: DataTypes.STRING(1000), allowNull: true },
    next_attempt_at: { type: DataTypes.DATE, allowNull: false },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('mail_outbox', ['status', 'next_attempt_at']);

  await q.createTable('account_tokens', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    user_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'users', key: 'id' },
      onDelete: 'CASCADE',
    },
    purpose: { type: DataTypes.ENUM('verify_email', 'password_reset'), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('account_tokens', ['user_id', 'purpose']);

  await q.addColumn('users', 'email_verified_at', { type: DataTypes.DATE, allowNull: true });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.removeColumn('users', 'email_verified_at');
  await q.dropTable('account_tokens');
  await q.dropTable('mail_outbox');
};
