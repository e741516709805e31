// After the shoot: ratings, set reports (with photos) and flags on either.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import { PROCESSING_STATES, type ProcessingState } from '@shared/types';
import { SET_REPORT_OUTCOMES } from '@shared/evidence-terms';
import type { SetCondition } from '@shared/evidence';
import type { SetReportOutcome } from '@shared/ranking';
import { decimalColumn, jsonColumn } from './columns';
import type { User } from './user';

const hidingColumns = {
  hiddenAt: { type: DataTypes.DATE, allowNull: true },
  hiddenBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
  hiddenReason: { type: DataTypes.TEXT, allowNull: true },
};

export class Rating extends Model<InferAttributes<Rating>, InferCreationAttributes<Rating>> {
  declare id: CreationOptional<number>;
  declare partId: number;
  declare userId: number;
  declare stars: number;
  declare comment: string | null;
  declare hiddenAt: Date | null;
  declare hiddenBy: number | null;
  declare hiddenReason: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare user?: NonAttribute<User>;
}

export class SetReport extends Model<InferAttributes<SetReport>, InferCreationAttributes<SetReport>> {
  declare id: CreationOptional<number>;
  declare partId: number;
  declare userId: number;
  declare production: string;
  declare daysInUse: number;
  declare conditions: SetCondition[];
  declare recipeId: number | null;
  declare material: string;
  declare infillPct: number | null;
  declare walls: number | null;
  declare outcome: SetReportOutcome;
  declare notes: string | null;
  declare hiddenAt: Date | null;
  declare hiddenBy: number | null;
  declare hiddenReason: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare user?: NonAttribute<User>;
  declare photos?: NonAttribute<ReportPhoto[]>;
}

export class ReportPhoto extends Model<InferAttributes<ReportPhoto>, InferCreationAttributes<ReportPhoto>> {
  declare id: CreationOptional<number>;
  declare reportId: number;
  declare storedName: string;
  declare originalName: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare processing: CreationOptional<ProcessingState>;
  declare processingAttempts: CreationOptional<number>;
  declare width: number | null;
  declare height: number | null;
}

export class ContentFlag extends Model<InferAttributes<ContentFlag>, InferCreationAttributes<ContentFlag>> {
  declare id: CreationOptional<number>;
  declare targetType: 'rating' | 'report';
  declare targetId: number;
  declare userId: number;
  declare reason: string;
  declare resolvedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

export function initEvidence(sequelize: Sequelize) {
  Rating.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      stars: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
      comment: { type: DataTypes.TEXT, allowNull: true },
      ...hidingColumns,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'ratings', modelName: 'Rating' },
  );
  SetReport.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      production: { type: DataTypes.STRING(120), allowNull: false },
      daysInUse: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      conditions: jsonColumn<SetCondition[]>('conditions', false, []),
      recipeId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      material: { type: DataTypes.STRING(20), allowNull: false },
      infillPct: decimalColumn('infillPct', 5, 2, true),
      walls: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      outcome: { type: DataTypes.ENUM(...SET_REPORT_OUTCOMES), allowNull: false },
      notes: { type: DataTypes.TEXT, allowNull: true },
      ...hidingColumns,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'set_reports', modelName: 'SetReport' },
  );
  ReportPhoto.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      reportId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      storedName: { type: DataTypes.STRING(80), allowNull: false, unique: true },
      originalName: { type: DataTypes.STRING(200), allowNull: false },
      sizeBytes: {
        type: DataTypes.BIGINT.UNSIGNED,
        allowNull: false,
        get(this: ReportPhoto) {
          return Number(this.getDataValue('sizeBytes'));
        },
      },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      processing: { type: DataTypes.ENUM(...PROCESSING_STATES), allowNull: false, defaultValue: 'pending' },
      processingAttempts: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 },
      width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    },
    { sequelize, tableName: 'report_photos', modelName: 'ReportPhoto' },
  );
  ContentFlag.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      targetType: { type: DataTypes.ENUM('rating', 'report'), allowNull: false },
      targetId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      reason: { type: DataTypes.TEXT, allowNull: false },
      resolvedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'content_flags', modelName: 'ContentFlag' },
  );
}
