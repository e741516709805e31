import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { PART_STATUSES, type PartStatus } from '@shared/types';
import type { PartRevision } from './part-revision';
import type { User } from './user';

export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<number>;
  declare slug: string;
  declare authorId: ForeignKey<User['id']>;
  declare parentId: number | null;
  declare status: PartStatus;
  declare publishedRevisionId: number | null;
  declare latestRevisionId: number | null;
  /** Published to this crew only (its members and moderators see it), or null for everyone. */
  declare crewId: CreationOptional<number | null>;
  declare lockVersion: CreationOptional<number>;
  declare publishedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare author?: NonAttribute<User>;
  declare parent?: NonAttribute<Part | null>;
  declare adaptations?: NonAttribute<Part[]>;
  declare publishedRevision?: NonAttribute<PartRevision | null>;
  declare latestRevision?: NonAttribute<PartRevision | null>;
}

export function initPart(sequelize: Sequelize) {
  Part.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      slug: { type: DataTypes.STRING(100), allowNull: false, unique: true },
      parentId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      status: {
        type: DataTypes.ENUM(...PART_STATUSES),
        allowNull: false,
      },
      publishedRevisionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      latestRevisionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      crewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, defaultValue: null },
      lockVersion: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      publishedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'parts', modelName: 'Part' },
  );
}
