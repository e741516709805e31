import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { MAIL_STATUSES, type MailStatus, type OutboxItem } from '@shared/types';

/** One mail to one recipient in the outbox (table mail_outbox). Bodies are cleared once it is sent. */
export class MailMessage extends Model<InferAttributes<MailMessage>, InferCreationAttributes<MailMessage>> {
  declare id: CreationOptional<number>;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string | null;
  declare htmlBody: string | null;
  declare status: CreationOptional<MailStatus>;
  declare attempts: CreationOptional<number>;
  declare lastError: string | null;
  declare nextAttemptAt: Date;
  declare sentAt: Date | null;
  /** The instance delivering it now (with nextAttemptAt as its lease), null between tries. */
  declare claimedBy: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  toItem(): OutboxItem {
    return {
      id: this.id,
      to: this.toAddress,
      subject: this.subject,
      status: this.status,
      attempts: this.attempts,
      lastError: this.lastError,
      createdAt: this.createdAt.toISOString(),
      sentAt: this.sentAt ? this.sentAt.toISOString() : null,
    };
  }
}

export function initMailMessage(sequelize: Sequelize) {
  MailMessage.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      toAddress: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(255), allowNull: false },
      textBody: { type: DataTypes.TEXT('medium'), allowNull: true },
      htmlBody: { type: DataTypes.TEXT('medium'), allowNull: true },
      status: { type: DataTypes.ENUM(...MAIL_STATUSES), allowNull: false, defaultValue: 'queued' },
      attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      lastError: { type: DataTypes.STRING(1000), allowNull: true },
      nextAttemptAt: { type: DataTypes.DATE, allowNull: false },
      sentAt: { type: DataTypes.DATE, allowNull: true },
      claimedBy: { type: DataTypes.STRING(100), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'mail_outbox', modelName: 'MailMessage' },
  );
}
