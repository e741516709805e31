import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MeshAnalysis } from '@shared/mesh';
import { FILE_KINDS, type FileKind, PROCESSING_STATES, type ProcessingState } from '@shared/types';
import { jsonColumn } from './columns';

export class PartFile extends Model<InferAttributes<PartFile>, InferCreationAttributes<PartFile>> {
  declare id: CreationOptional<number>;
  declare partId: number;
  declare kind: FileKind;
  declare storedName: string;
  declare originalName: string;
  declare mime: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare format: string | null;
  declare analysis: MeshAnalysis | null;
  declare processing: CreationOptional<ProcessingState>;
  declare processingAttempts: CreationOptional<number>;
  /** Models only: the shaded preview picture (null for other kinds). */
  declare renderStatus: CreationOptional<ProcessingState | null>;
  declare renderAttempts: CreationOptional<number>;
  declare width: number | null;
  declare height: number | null;
  declare createdBy: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPartFile(sequelize: Sequelize) {
  PartFile.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      kind: { type: DataTypes.ENUM(...FILE_KINDS), allowNull: false },
      storedName: { type: DataTypes.STRING(80), allowNull: false, unique: true },
      originalName: { type: DataTypes.STRING(200), allowNull: false },
      mime: { type: DataTypes.STRING(100), allowNull: false },
      sizeBytes: {
        type: DataTypes.BIGINT.UNSIGNED,
        allowNull: false,
        get(this: PartFile) {
          return Number(this.getDataValue('sizeBytes'));
        },
      },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      format: { type: DataTypes.STRING(20), allowNull: true },
      analysis: jsonColumn<MeshAnalysis>('analysis', true),
      processing: { type: DataTypes.ENUM(...PROCESSING_STATES), allowNull: false, defaultValue: 'ready' },
      processingAttempts: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 },
      renderStatus: { type: DataTypes.ENUM(...PROCESSING_STATES), allowNull: true, defaultValue: null },
      renderAttempts: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 },
      width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'part_files', modelName: 'PartFile' },
  );
}
