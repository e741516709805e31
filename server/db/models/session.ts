import { DataTypes, Model, type Sequelize } from 'sequelize';

/** Rows of the express-session store (connect-session-sequelize reads and writes sid, expires, data). */
export class Session extends Model {
  declare sid: string;
  declare userId: number | null;
  declare expires: Date | null;
  declare data: string | null;
}

export function initSession(sequelize: Sequelize) {
  Session.init(
    {
      sid: { type: DataTypes.STRING(64), primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      expires: DataTypes.DATE,
      data: DataTypes.TEXT,
    },
    { sequelize, tableName: 'sessions', modelName: 'Session' },
  );
}
