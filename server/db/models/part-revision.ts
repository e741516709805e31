import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { KeyDimension, MountRef } from '@shared/schemas/part';
import { REVISION_STATUSES, type RevisionStatus } from '@shared/types';
import type { CameraBody } from './camera-body';
import type { PartFile } from './part-file';
import type { Recipe } from './recipe';
import { decimalColumn, jsonColumn } from './columns';

export class PartRevision extends Model<InferAttributes<PartRevision>, InferCreationAttributes<PartRevision>> {
  declare id: CreationOptional<number>;
  declare partId: number;
  declare number: number;
  declare status: RevisionStatus;
  declare title: string;
  declare summary: string;
  declare descriptionMd: string;
  declare descriptionHtml: string;
  declare category: string;
  declare licence: string;
  declare mounts: MountRef[];
  declare keyDimensions: KeyDimension[];
  declare carriesLoad: boolean;
  declare overhead: boolean;
  declare vehicle: boolean;
  declare heat: boolean;
  declare testedLoadKg: number | null;
  /** The generator this part was made with on the make pages, and its parameters; null for drawn parts. */
  declare makeKind: string | null;
  declare makeParams: Record<string, unknown> | null;
  declare createdBy: number;
  declare submittedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare bodies?: NonAttribute<CameraBody[]>;
  declare recipes?: NonAttribute<Recipe[]>;
  declare files?: NonAttribute<PartFile[]>;
}

export function initPartRevision(sequelize: Sequelize) {
  PartRevision.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      status: {
        type: DataTypes.ENUM(...REVISION_STATUSES),
        allowNull: false,
      },
      title: { type: DataTypes.STRING(120), allowNull: false },
      summary: { type: DataTypes.STRING(280), allowNull: false },
      descriptionMd: { type: DataTypes.TEXT('medium'), allowNull: false },
      descriptionHtml: { type: DataTypes.TEXT('medium'), allowNull: false },
      category: { type: DataTypes.STRING(40), allowNull: false },
      licence: { type: DataTypes.STRING(40), allowNull: false },
      mounts: jsonColumn<MountRef[]>('mounts', false, []),
      keyDimensions: jsonColumn<KeyDimension[]>('keyDimensions', false, []),
      carriesLoad: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      overhead: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      vehicle: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      heat: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      testedLoadKg: decimalColumn('testedLoadKg', 7, 2, true),
      makeKind: { type: DataTypes.STRING(40), allowNull: true },
      makeParams: jsonColumn<Record<string, unknown>>('makeParams', true),
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      submittedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'part_revisions', modelName: 'PartRevision' },
  );
}
