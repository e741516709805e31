// Wanted parts: a request for a part, its photos or sketches, and the parts offered in answer.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import { PROCESSING_STATES, type ProcessingState } from '@shared/types';
import type { BuildSize } from '@shared/schemas/builds';
import { WANTED_CLOSE_REASONS, WANTED_STATUSES, type WantedCloseReason, type WantedStatus } from '@shared/schemas/wanted';
import type { CameraBody } from './camera-body';
import { jsonColumn } from './columns';
import type { Part } from './part';
import type { User } from './user';

export class WantedRequest extends Model<InferAttributes<WantedRequest>, InferCreationAttributes<WantedRequest>> {
  declare id: CreationOptional<number>;
  declare authorId: number;
  declare title: string;
  declare details: string;
  declare bodyId: number | null;
  declare mounts: string[];
  declare keySizes: BuildSize[];
  /** YYYY-MM-DD */
  declare neededBy: string | null;
  declare searchedFor: string | null;
  declare status: CreationOptional<WantedStatus>;
  declare closeReason: WantedCloseReason | null;
  declare closeNote: string | null;
  declare closedAt: Date | null;
  declare closedBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare author?: NonAttribute<User>;
  declare closer?: NonAttribute<User | null>;
  declare body?: NonAttribute<CameraBody | null>;
  declare photos?: NonAttribute<WantedPhoto[]>;
  declare answers?: NonAttribute<WantedAnswer[]>;
}

export class WantedPhoto extends Model<InferAttributes<WantedPhoto>, InferCreationAttributes<WantedPhoto>> {
  declare id: CreationOptional<number>;
  declare requestId: number;
  declare storedName: string;
  declare originalName: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare processing: CreationOptional<ProcessingState>;
  declare processingAttempts: CreationOptional<number>;
  declare width: number | null;
  declare height: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class WantedAnswer extends Model<InferAttributes<WantedAnswer>, InferCreationAttributes<WantedAnswer>> {
  declare id: CreationOptional<number>;
  declare requestId: number;
  declare partId: number;
  declare userId: number;
  declare note: string;
  declare notifiedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare user?: NonAttribute<User>;
  declare part?: NonAttribute<Part>;
  declare request?: NonAttribute<WantedRequest>;
}

export function initWanted(sequelize: Sequelize) {
  WantedRequest.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      authorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      title: { type: DataTypes.STRING(120), allowNull: false },
      details: { type: DataTypes.TEXT, allowNull: false },
      bodyId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      mounts: jsonColumn<string[]>('mounts', false, []),
      keySizes: jsonColumn<BuildSize[]>('keySizes', false, []),
      neededBy: { type: DataTypes.DATEONLY, allowNull: true },
      searchedFor: { type: DataTypes.STRING(200), allowNull: true },
      status: { type: DataTypes.ENUM(...WANTED_STATUSES), allowNull: false, defaultValue: 'open' },
      closeReason: { type: DataTypes.ENUM(...WANTED_CLOSE_REASONS), allowNull: true },
      closeNote: { type: DataTypes.STRING(500), allowNull: true },
      closedAt: { type: DataTypes.DATE, allowNull: true },
      closedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'wanted_requests', modelName: 'WantedRequest' },
  );
  WantedPhoto.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      requestId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      storedName: { type: DataTypes.STRING(80), allowNull: false, unique: true },
      originalName: { type: DataTypes.STRING(200), allowNull: false },
      sizeBytes: {
        type: DataTypes.BIGINT.UNSIGNED,
        allowNull: false,
        get(this: WantedPhoto) {
          return Number(this.getDataValue('sizeBytes'));
        },
      },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      processing: { type: DataTypes.ENUM(...PROCESSING_STATES), allowNull: false, defaultValue: 'pending' },
      processingAttempts: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 },
      width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'wanted_photos', modelName: 'WantedPhoto' },
  );
  WantedAnswer.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      requestId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      note: { type: DataTypes.STRING(1000), allowNull: false },
      notifiedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'wanted_answers', modelName: 'WantedAnswer' },
  );
}
