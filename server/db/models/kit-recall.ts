// A banner on a kit: one of its parts was retired or its warnings changed. It stays until the kit's
// owner acknowledges it. The part's title is kept as it was when the recall was raised.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type KitRecallKind = 'retired' | 'cautions' | 'reports';

export class KitRecall extends Model<InferAttributes<KitRecall>, InferCreationAttributes<KitRecall>> {
  declare id: CreationOptional<number>;
  declare kitId: number;
  declare partId: number;
  declare kind: KitRecallKind;
  declare partTitle: string;
  declare reason: string;
  declare acknowledgedAt: Date | null;
  declare acknowledgedBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export function initKitRecall(sequelize: Sequelize) {
  KitRecall.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      kitId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      kind: { type: DataTypes.ENUM('retired', 'cautions', 'reports'), allowNull: false },
      partTitle: { type: DataTypes.STRING(200), allowNull: false },
      reason: { type: DataTypes.TEXT, allowNull: false },
      acknowledgedAt: { type: DataTypes.DATE, allowNull: true },
      acknowledgedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'kit_recalls', modelName: 'KitRecall', updatedAt: false },
  );
}
