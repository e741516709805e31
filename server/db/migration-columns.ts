// Column shapes the migrations share: an unsigned auto-increment key, a foreign key to another
// table's id, and the two timestamps every table carries.
import { DataTypes } from 'sequelize';

export const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };

export const ref = (model: string, onDelete: 'CASCADE' | 'SET NULL' | 'RESTRICT' = 'CASCADE', allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model, key: 'id' },
  onDelete,
});

export const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
