import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { NoticeInfo } from '@shared/types';

export class Notice extends Model<InferAttributes<Notice>, InferCreationAttributes<Notice>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare kind: string;
  declare title: string;
  declare body: string;
  declare link: string | null;
  declare readAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  toInfo(): NoticeInfo {
    return {
      id: this.id,
      kind: this.kind,
      title: this.title,
      body: this.body,
      link: this.link,
      read: this.readAt !== null,
      createdAt: this.createdAt.toISOString(),
    };
  }
}

export function initNotice(sequelize: Sequelize) {
  Notice.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      kind: { type: DataTypes.STRING(30), allowNull: false },
      title: { type: DataTypes.STRING(200), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: false },
      link: { type: DataTypes.STRING(300), allowNull: true },
      readAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'notices', modelName: 'Notice' },
  );
}
