import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MaterialId } from '@shared/materials';
import { decimalColumn, jsonColumn } from './columns';

/** A member's own filament prices (only the materials they priced) and electricity price. */
export class PriceSheet extends Model<InferAttributes<PriceSheet>, InferCreationAttributes<PriceSheet>> {
  declare userId: number;
  declare pricesPerKg: Partial<Record<MaterialId, number>>;
  declare pricePerKwh: number | null;
  /** Charged per hour of printing on print requests; null when the owner charges none. */
  declare machineHourRate: CreationOptional<number | null>;
  /** ISO 4217; null until the member picks one. */
  declare currency: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPriceSheet(sequelize: Sequelize) {
  PriceSheet.init(
    {
      userId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      pricesPerKg: jsonColumn<Partial<Record<MaterialId, number>>>('pricesPerKg', false, {}),
      pricePerKwh: decimalColumn('pricePerKwh', 8, 4, true),
      machineHourRate: decimalColumn('machineHourRate', 10, 4, true),
      currency: { type: DataTypes.CHAR(3), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'price_sheets', modelName: 'PriceSheet' },
  );
}
