// A member's choice per kind of notice: the bell, the mail, both or neither. No row means both.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class NoticePreference extends Model<InferAttributes<NoticePreference>, InferCreationAttributes<NoticePreference>> {
  declare userId: number;
  declare kind: string;
  declare bell: boolean;
  declare mail: boolean;
  declare updatedAt: CreationOptional<Date>;
}

export function initNoticePreference(sequelize: Sequelize) {
  NoticePreference.init(
    {
      userId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      kind: { type: DataTypes.STRING(30), primaryKey: true },
      bell: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      mail: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'notice_preferences', modelName: 'NoticePreference', createdAt: false },
  );
}
