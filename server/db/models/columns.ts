import { DataTypes, type ModelAttributeColumnOptions } from 'sequelize';

/** A TEXT column holding JSON, parsed on read (MariaDB's JSON type is LONGTEXT underneath). */
export function jsonColumn<T>(field: string, allowNull = false, fallback: T | null = null): ModelAttributeColumnOptions {
  return {
    type: DataTypes.TEXT,
    allowNull,
    get(this: { getDataValue(key: string): string | null }) {
      const raw = this.getDataValue(field);
      return raw == null ? fallback : (JSON.parse(raw) as T);
    },
    set(this: { setDataValue(key: string, value: unknown): void }, value: T | null) {
      this.setDataValue(field, value == null ? null : JSON.stringify(value));
    },
  };
}

/** A DECIMAL column read back as a JS number (the driver returns DECIMAL as a string). */
export function decimalColumn(field: string, precision: number, scale: number, allowNull = false): ModelAttributeColumnOptions {
  return {
    type: DataTypes.DECIMAL(precision, scale),
    allowNull,
    get(this: { getDataValue(key: string): unknown }) {
      const raw = this.getDataValue(field);
      return raw == null ? null : Number(raw);
    },
  };
}
