import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { DEFAULT_BED_MARGIN_MM } from '@shared/estimate';
import { decimalColumn } from './columns';

/** A member's own printer: only its owner sees it and can put kit items on it. */
export class Printer extends Model<InferAttributes<Printer>, InferCreationAttributes<Printer>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  declare name: string;
  declare bedXMm: number;
  declare bedYMm: number;
  declare bedZMm: number;
  declare nozzleMm: number;
  /** Kept free round the bed's edge for a brim or skirt, per side. */
  declare bedMarginMm: CreationOptional<number>;
  declare watts: number | null;
  declare notes: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  bedMm(): [number, number, number] {
    return [this.bedXMm, this.bedYMm, this.bedZMm];
  }
}

export function initPrinter(sequelize: Sequelize) {
  Printer.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ownerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      bedXMm: decimalColumn('bedXMm', 6, 1),
      bedYMm: decimalColumn('bedYMm', 6, 1),
      bedZMm: decimalColumn('bedZMm', 6, 1),
      nozzleMm: decimalColumn('nozzleMm', 4, 2),
      bedMarginMm: { ...decimalColumn('bedMarginMm', 4, 1), defaultValue: DEFAULT_BED_MARGIN_MM },
      watts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'printers', modelName: 'Printer' },
  );
}
