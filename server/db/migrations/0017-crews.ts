// Crews: a production's camera department as a group, its members and their crew roles, invitations
// sent by mail, parts published to one crew only (parts.crew_id) and kits shared with a whole crew.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';
import { id, ref, timestamps } from '../migration-columns';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('crews', {
    id,
    name: { type: DataTypes.STRING(80), allowNull: false },
    production: { type: DataTypes.STRING(120), allowNull: true },
    // ISO 4217 alphabetic code, e.g. EUR
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    // percent, e.g. 19.00; null when the crew bills without tax
    tax_rate_pct: { type: DataTypes.DECIMAL(5, 2), allowNull: true },
    created_by: ref('users', 'SET NULL', true),
    ...timestamps,
  });

  await q.createTable('crew_members', {
    id,
    crew_id: ref('crews'),
    user_id: ref('users'),
    role: { type: DataTypes.ENUM('lead', 'member'), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('crew_members', ['crew_id', 'user_id'], { unique: true });
  await q.addIndex('crew_members', ['user_id']);

  await q.createTable('crew_invitations', {
    id,
    crew_id: ref('crews'),
    email: { type: DataTypes.STRING(254), allowNull: false },
    role: { type: DataTypes.ENUM('lead', 'member'), allowNull: false },
    // sha256 of the token the mail carries; the token itself is never stored
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    invited_by: ref('users', 'SET NULL', true),
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_by: ref('users', 'SET NULL', true),
    withdrawn_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('crew_invitations', ['crew_id', 'email']);

  // a crew with crew-only parts cannot be deleted (the service says so first)
  await q.addColumn('parts', 'crew_id', ref('crews', 'RESTRICT', true));
  await q.addIndex('parts', ['crew_id']);

  await q.createTable('kit_crew_shares', {
    id,
    kit_id: ref('kits'),
    crew_id: ref('crews'),
    access: { type: DataTypes.ENUM('read', 'edit'), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('kit_crew_shares', ['kit_id', 'crew_id'], { unique: true });
  await q.addIndex('kit_crew_shares', ['crew_id']);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.dropTable('kit_crew_shares');
  await q.removeIndex('parts', ['crew_id']);
  await q.removeColumn('parts', 'crew_id');
  for (const table of ['crew_invitations', 'crew_members', 'crews']) await q.dropTable(table);
};
