// A key the client sends with a write it may repeat (a set report or rating queued offline): the first
// request files it and stores its answer here; a repeat with the same key gets that answer back.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class ClientKey extends Model<InferAttributes<ClientKey>, InferCreationAttributes<ClientKey>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare clientKey: string;
  /** What the key was used for, e.g. "report:12"; the same key for something else is refused. */
  declare scope: string;
  /** The JSON answer of the first request. */
  declare result: string;
  declare createdAt: CreationOptional<Date>;
}

export function initClientKey(sequelize: Sequelize) {
  ClientKey.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      clientKey: { type: DataTypes.STRING(64), allowNull: false },
      scope: { type: DataTypes.STRING(60), allowNull: false },
      result: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'client_keys', modelName: 'ClientKey', updatedAt: false },
  );
}
