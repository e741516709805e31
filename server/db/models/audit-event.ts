import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import { jsonColumn } from './columns';
import type { User } from './user';

export type AuditAction = 'submit' | 'resubmit' | 'edit' | 'approve' | 'send_back' | 'reject' | 'retire' | 'hide_rating' | 'hide_report';

/** One decision on record: who did what to which part, when, and why. Rows are never updated. */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>;
  declare partId: number | null;
  declare revisionId: number | null;
  declare actorId: number;
  declare action: AuditAction;
  declare note: string | null;
  declare details: Record<string, unknown> | null;
  declare createdAt: CreationOptional<Date>;
  declare actor?: NonAttribute<User>;
}

export function initAuditEvent(sequelize: Sequelize) {
  AuditEvent.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      revisionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      actorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      action: { type: DataTypes.STRING(30), allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: true },
      details: jsonColumn<Record<string, unknown>>('details', true),
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'audit_events', modelName: 'AuditEvent' },
  );
}
