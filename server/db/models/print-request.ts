// Print requests between crew members, each step on record, and the payments service's events.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import { PAYMENT_STATES, type PaymentState, PRINT_REQUEST_STATES, type PrintRequestState } from '@shared/print-requests';
import type { PrintPrice } from '@shared/print-price';
import { decimalColumn, jsonColumn } from './columns';
import type { User } from './user';

export class PrintRequest extends Model<InferAttributes<PrintRequest>, InferCreationAttributes<PrintRequest>> {
  declare id: CreationOptional<number>;
  declare requesterId: number;
  declare ownerId: number;
  declare printerId: number | null;
  /** The printer as it was when asked (it may be renamed or deleted later). */
  declare printerName: string;
  declare printerWatts: number | null;
  declare crewId: number | null;
  declare kind: 'part' | 'kit';
  declare partId: number | null;
  declare recipeId: number | null;
  declare kitId: number | null;
  declare title: string;
  declare quantity: number;
  declare material: string;
  declare neededBy: string | null;
  declare note: string | null;
  /** The estimate for all pieces, made when the request was filed: grams per material, and in all. */
  declare filament: { material: string; grams: number }[];
  declare grams: number;
  declare minutes: number;
  declare estimateNotes: string[];
  declare currency: string;
  declare status: CreationOptional<PrintRequestState> & PrintRequestState;
  /** Frozen when the owner accepts. */
  declare priceMinor: number | null;
  /** The whole breakdown as frozen at accept. */
  declare frozenPrice: PrintPrice | null;
  declare pricedAt: Date | null;
  declare paymentStatus: CreationOptional<PaymentState> & PaymentState;
  declare paidMinor: CreationOptional<number>;
  declare checkoutId: string | null;
  declare paymentRef: string | null;
  declare paidAt: Date | null;
  declare refundRef: string | null;
  declare refundedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare requester?: NonAttribute<User>;
  declare owner?: NonAttribute<User>;
  declare events?: NonAttribute<PrintRequestEvent[]>;
}

export class PrintRequestEvent extends Model<InferAttributes<PrintRequestEvent>, InferCreationAttributes<PrintRequestEvent>> {
  declare id: CreationOptional<number>;
  declare requestId: number;
  /** Null when the payments service did it (a webhook). */
  declare actorId: number | null;
  declare action: string;
  declare fromStatus: string | null;
  declare toStatus: string | null;
  declare details: Record<string, unknown> | null;
  declare createdAt: CreationOptional<Date>;

  declare actor?: NonAttribute<User>;
}

/** One row per webhook event taken in: the same event id a second time changes nothing. */
export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
  declare eventId: string;
  declare type: string;
  declare requestId: number | null;
  declare outcome: string;
  declare createdAt: CreationOptional<Date>;
}

export function initPrintRequests(sequelize: Sequelize) {
  PrintRequest.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      requesterId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      ownerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      printerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      printerName: { type: DataTypes.STRING(80), allowNull: false },
      printerWatts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      crewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      kind: { type: DataTypes.ENUM('part', 'kit'), allowNull: false },
      partId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      recipeId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      kitId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      title: { type: DataTypes.STRING(200), allowNull: false },
      quantity: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
      material: { type: DataTypes.STRING(20), allowNull: false },
      neededBy: { type: DataTypes.DATEONLY, allowNull: true },
      note: { type: DataTypes.TEXT, allowNull: true },
      filament: jsonColumn<{ material: string; grams: number }[]>('filament', false, []),
      grams: decimalColumn('grams', 10, 1),
      minutes: decimalColumn('minutes', 10, 1),
      estimateNotes: jsonColumn<string[]>('estimateNotes', false, []),
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      status: {
        type: DataTypes.ENUM(...PRINT_REQUEST_STATES),
        allowNull: false,
        defaultValue: 'requested',
      },
      priceMinor: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      frozenPrice: jsonColumn<PrintPrice>('frozenPrice', true),
      pricedAt: { type: DataTypes.DATE, allowNull: true },
      paymentStatus: { type: DataTypes.ENUM(...PAYMENT_STATES), allowNull: false, defaultValue: 'unpaid' },
      paidMinor: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      checkoutId: { type: DataTypes.STRING(120), allowNull: true },
      paymentRef: { type: DataTypes.STRING(120), allowNull: true },
      paidAt: { type: DataTypes.DATE, allowNull: true },
      refundRef: { type: DataTypes.STRING(120), allowNull: true },
      refundedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'print_requests', modelName: 'PrintRequest' },
  );
  PrintRequestEvent.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      requestId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      actorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      action: { type: DataTypes.STRING(30), allowNull: false },
      fromStatus: { type: DataTypes.STRING(20), allowNull: true },
      toStatus: { type: DataTypes.STRING(20), allowNull: true },
      details: jsonColumn<Record<string, unknown>>('details', true),
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'print_request_events', modelName: 'PrintRequestEvent', updatedAt: false },
  );
  PaymentEvent.init(
    {
      eventId: { type: DataTypes.STRING(120), primaryKey: true },
      type: { type: DataTypes.STRING(80), allowNull: false },
      requestId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      outcome: { type: DataTypes.STRING(60), allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'payment_events', modelName: 'PaymentEvent', updatedAt: false },
  );
}
