import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { CameraBodyInfo } from '@shared/types';
import { jsonColumn } from './columns';

export class CameraBody extends Model<InferAttributes<CameraBody>, InferCreationAttributes<CameraBody>> {
  declare id: CreationOptional<number>;
  declare slug: string;
  declare maker: string;
  declare model: string;
  declare aliases: string[];

  toInfo(): CameraBodyInfo {
    return { slug: this.slug, maker: this.maker, model: this.model, aliases: this.aliases };
  }
}

export function initCameraBody(sequelize: Sequelize) {
  CameraBody.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      slug: { type: DataTypes.STRING(80), allowNull: false, unique: true },
      maker: { type: DataTypes.STRING(80), allowNull: false },
      model: { type: DataTypes.STRING(80), allowNull: false },
      aliases: jsonColumn<string[]>('aliases', false, []),
    },
    { sequelize, tableName: 'camera_bodies', modelName: 'CameraBody' },
  );
}
