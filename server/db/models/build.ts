// A member's camera build: what search's "fits my build" compares parts against.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { BuildSize } from '@shared/schemas/builds';
import type { CameraBody } from './camera-body';
import { jsonColumn } from './columns';

export class Build extends Model<InferAttributes<Build>, InferCreationAttributes<Build>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  declare name: string;
  declare bodyId: number | null;
  declare mounts: string[];
  declare keySizes: BuildSize[];
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare body?: NonAttribute<CameraBody | null>;
}

export function initBuild(sequelize: Sequelize) {
  Build.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ownerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      bodyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      mounts: jsonColumn<string[]>('mounts', false, []),
      keySizes: jsonColumn<BuildSize[]>('keySizes', false, []),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'builds', modelName: 'Build' },
  );
}
