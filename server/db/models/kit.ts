// Shoot kits: what a crew plans to print for a shoot, and who else may see or change the plan.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { HeatExposure, MaterialId } from '@shared/materials';
import { KIT_ACCESS, type KitShareAccess } from '@shared/schemas/planning';
import { decimalColumn, jsonColumn } from './columns';
import type { Part } from './part';
import type { Printer } from './printer';
import type { Recipe } from './recipe';
import type { User } from './user';

/** A made item's mesh figures, measured when it was added to the kit. */
export interface MadeGeometry {
  volumeMm3: number;
  areaMm2: number;
  sizeMm: [number, number, number];
  loadBearing: boolean;
}

export class Kit extends Model<InferAttributes<Kit>, InferCreationAttributes<Kit>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  declare name: string;
  declare production: string | null;
  /** YYYY-MM-DD */
  declare startsOn: string | null;
  declare endsOn: string | null;
  declare locationNotes: string | null;
  declare heatExposure: HeatExposure | null;
  declare printHoursPerDay: number;
  declare printerPrice: number | null;
  /** For the production office's statement. */
  declare purchaseOrder: CreationOptional<string | null>;
  declare statementFees: CreationOptional<{ label: string; amount: number }[] | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare owner?: NonAttribute<User>;
  declare items?: NonAttribute<KitItem[]>;
  declare shares?: NonAttribute<KitShare[]>;
}

export class KitShare extends Model<InferAttributes<KitShare>, InferCreationAttributes<KitShare>> {
  declare id: CreationOptional<number>;
  declare kitId: number;
  declare userId: number;
  declare access: KitShareAccess;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare user?: NonAttribute<User>;
}

export class KitItem extends Model<InferAttributes<KitItem>, InferCreationAttributes<KitItem>> {
  declare id: CreationOptional<number>;
  declare kitId: number;
  /** Null for a made item: then makeKind and makeParams say what to make. */
  declare partId: number | null;
  declare makeKind: string | null;
  declare makeParams: Record<string, unknown> | null;
  declare makeGeometry: MadeGeometry | null;
  declare position: number;
  declare quantity: number;
  declare recipeId: number | null;
  /** Overrides the recipe's material; the recipe's other settings stay. */
  declare material: MaterialId | null;
  declare printerId: number | null;
  declare boughtPriceEach: number | null;
  declare servicePriceEach: number | null;
  declare serviceShipping: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare part?: NonAttribute<Part>;
  declare recipe?: NonAttribute<Recipe | null>;
  declare printer?: NonAttribute<Printer | null>;
}

export function initKits(sequelize: Sequelize) {
  Kit.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ownerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      production: { type: DataTypes.STRING(120), allowNull: true },
      startsOn: { type: DataTypes.DATEONLY, allowNull: true },
      endsOn: { type: DataTypes.DATEONLY, allowNull: true },
      locationNotes: { type: DataTypes.TEXT, allowNull: true },
      heatExposure: { type: DataTypes.STRING(20), allowNull: true },
      printHoursPerDay: { ...decimalColumn('printHoursPerDay', 4, 1), defaultValue: 8 },
      printerPrice: decimalColumn('printerPrice', 10, 2, true),
      purchaseOrder: { type: DataTypes.STRING(60), allowNull: true },
      statementFees: jsonColumn<{ label: string; amount: number }[]>('statementFees', true),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'kits', modelName: 'Kit' },
  );
  KitShare.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      kitId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      access: { type: DataTypes.ENUM(...KIT_ACCESS), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'kit_shares', modelName: 'KitShare' },
  );
  KitItem.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      kitId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      makeKind: { type: DataTypes.STRING(40), allowNull: true },
      makeParams: jsonColumn<Record<string, unknown>>('makeParams', true),
      makeGeometry: jsonColumn<MadeGeometry>('makeGeometry', true),
      position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      quantity: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      recipeId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      material: { type: DataTypes.STRING(20), allowNull: true },
      printerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      boughtPriceEach: decimalColumn('boughtPriceEach', 10, 2, true),
      servicePriceEach: decimalColumn('servicePriceEach', 10, 2, true),
      serviceShipping: decimalColumn('serviceShipping', 10, 2, true),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'kit_items', modelName: 'KitItem' },
  );
}
