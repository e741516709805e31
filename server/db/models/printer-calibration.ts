import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MaterialId } from '@shared/materials';
import { decimalColumn } from './columns';

/**
 * What the fit-test gauge showed on one printer in one material: the bore drawn at holeFitMm printed
 * at nominalMm, so holes are drawn holeCorrectionMm larger (outer sizes likewise, when measured).
 */
export class PrinterCalibration extends Model<InferAttributes<PrinterCalibration>, InferCreationAttributes<PrinterCalibration>> {
  declare id: CreationOptional<number>;
  declare printerId: number;
  declare material: MaterialId;
  declare nominalMm: number;
  declare holeFitMm: number;
  declare holeCorrectionMm: number;
  declare outerFitMm: number | null;
  declare outerCorrectionMm: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPrinterCalibration(sequelize: Sequelize) {
  PrinterCalibration.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      printerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      material: { type: DataTypes.STRING(20), allowNull: false },
      nominalMm: decimalColumn('nominalMm', 7, 3),
      holeFitMm: decimalColumn('holeFitMm', 7, 3),
      holeCorrectionMm: decimalColumn('holeCorrectionMm', 6, 3),
      outerFitMm: decimalColumn('outerFitMm', 7, 3, true),
      outerCorrectionMm: decimalColumn('outerCorrectionMm', 6, 3, true),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'printer_calibrations', modelName: 'PrinterCalibration' },
  );
}
