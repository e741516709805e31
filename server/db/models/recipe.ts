import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { RECIPE_PURPOSES, type RecipeInput, SUPPORT_MODES } from '@shared/schemas/recipe';
import { decimalColumn, jsonColumn } from './columns';

export class Recipe extends Model<InferAttributes<Recipe>, InferCreationAttributes<Recipe>> {
  declare id: CreationOptional<number>;
  declare revisionId: number;
  declare position: number;
  declare purpose: RecipeInput['purpose'];
  declare material: RecipeInput['material'];
  declare nozzleMm: number;
  declare layerMm: number;
  declare walls: number;
  declare topBottomLayers: number;
  declare infillPct: number;
  declare infillPattern: RecipeInput['infillPattern'];
  declare hotendC: number;
  declare bedC: number;
  declare speedMmS: number;
  declare supports: RecipeInput['supports'];
  declare orientationNote: string | null;
  declare printerBedMm: [number, number, number] | null;
  declare resultNotes: string | null;

  toInput(): RecipeInput {
    const { id: _id, revisionId: _r, position: _p, ...rest } = this.get({ plain: true }) as Recipe;
    return {
      ...rest,
      orientationNote: rest.orientationNote ?? undefined,
      printerBedMm: rest.printerBedMm ?? undefined,
      resultNotes: rest.resultNotes ?? undefined,
    } as RecipeInput;
  }
}

export function initRecipe(sequelize: Sequelize) {
  Recipe.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      revisionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      purpose: { type: DataTypes.ENUM(...RECIPE_PURPOSES), allowNull: false },
      material: { type: DataTypes.STRING(20), allowNull: false },
      nozzleMm: decimalColumn('nozzleMm', 4, 2),
      layerMm: decimalColumn('layerMm', 4, 3),
      walls: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      topBottomLayers: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      infillPct: decimalColumn('infillPct', 5, 2),
      infillPattern: { type: DataTypes.STRING(20), allowNull: false },
      hotendC: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      bedC: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      speedMmS: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      supports: { type: DataTypes.ENUM(...SUPPORT_MODES), allowNull: false },
      orientationNote: { type: DataTypes.STRING(500), allowNull: true },
      printerBedMm: jsonColumn<[number, number, number]>('printerBedMm', true),
      resultNotes: { type: DataTypes.TEXT, allowNull: true },
    },
    { sequelize, tableName: 'recipes', modelName: 'Recipe' },
  );
}
