// Crews, their members (crew role lead or member), invitations by mail, and kits shared with a crew.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import { CREW_ROLES, type CrewRole } from '@shared/schemas/crews';
import { KIT_ACCESS, type KitShareAccess } from '@shared/schemas/planning';
import { decimalColumn } from './columns';
import type { User } from './user';

export class Crew extends Model<InferAttributes<Crew>, InferCreationAttributes<Crew>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare production: string | null;
  /** ISO 4217 alphabetic code. */
  declare currency: string;
  /** Percent (19 = 19 %), or null. */
  declare taxRatePct: number | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare members?: NonAttribute<CrewMember[]>;
}

export class CrewMember extends Model<InferAttributes<CrewMember>, InferCreationAttributes<CrewMember>> {
  declare id: CreationOptional<number>;
  declare crewId: number;
  declare userId: number;
  declare role: CrewRole;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare user?: NonAttribute<User>;
  declare crew?: NonAttribute<Crew>;
}

export class CrewInvitation extends Model<InferAttributes<CrewInvitation>, InferCreationAttributes<CrewInvitation>> {
  declare id: CreationOptional<number>;
  declare crewId: number;
  declare email: string;
  declare role: CrewRole;
  declare tokenHash: string;
  declare invitedBy: number | null;
  declare expiresAt: Date;
  declare acceptedAt: Date | null;
  declare acceptedBy: number | null;
  declare withdrawnAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare crew?: NonAttribute<Crew>;
  declare inviter?: NonAttribute<User | null>;
}

export class KitCrewShare extends Model<InferAttributes<KitCrewShare>, InferCreationAttributes<KitCrewShare>> {
  declare id: CreationOptional<number>;
  declare kitId: number;
  declare crewId: number;
  declare access: KitShareAccess;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare crew?: NonAttribute<Crew>;
}

const pk = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const role = { type: DataTypes.ENUM(...CREW_ROLES), allowNull: false };

export function initCrews(sequelize: Sequelize) {
  Crew.init(
    {
      id: pk,
      name: { type: DataTypes.STRING(80), allowNull: false },
      production: { type: DataTypes.STRING(120), allowNull: true },
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      taxRatePct: decimalColumn('taxRatePct', 5, 2, true),
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'crews', modelName: 'Crew' },
  );
  CrewMember.init(
    {
      id: pk,
      crewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      role,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'crew_members', modelName: 'CrewMember' },
  );
  CrewInvitation.init(
    {
      id: pk,
      crewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      email: { type: DataTypes.STRING(254), allowNull: false },
      role,
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      invitedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      acceptedAt: { type: DataTypes.DATE, allowNull: true },
      acceptedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      withdrawnAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'crew_invitations', modelName: 'CrewInvitation' },
  );
  KitCrewShare.init(
    {
      id: pk,
      kitId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      crewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      access: { type: DataTypes.ENUM(...KIT_ACCESS), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'kit_crew_shares', modelName: 'KitCrewShare' },
  );
}
