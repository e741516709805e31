import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const fk = (table: string, onDelete: 'CASCADE' | 'SET NULL' | 'RESTRICT' = 'CASCADE', allowNull = false) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: table, key: 'id' },
  onDelete,
});
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('camera_bodies', {
    id,
    slug: { type: DataTypes.STRING(80), allowNull: false, unique: true },
    maker: { type: DataTypes.STRING(80), allowNull: false },
    model: { type: DataTypes.STRING(80), allowNull: false },
    aliases: { type: DataTypes.TEXT, allowNull: false },
    ...timestamps,
  });

  await q.createTable('parts', {
    id,
    slug: { type: DataTypes.STRING(100), allowNull: false, unique: true },
    author_id: fk('users', 'RESTRICT'),
    parent_id: fk('parts', 'SET NULL', true),
    status: {
      type: DataTypes.ENUM('draft', 'in_review', 'published', 'sent_back', 'rejected', 'retired'),
      allowNull: false,
    },
    published_revision_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    latest_revision_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    lock_version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    published_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('parts', ['status']);
  await q.addIndex('parts', ['author_id']);

  await q.createTable('part_revisions', {
    id,
    part_id: fk('parts'),
    number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    status: {
      type: DataTypes.ENUM('draft', 'in_review', 'published', 'sent_back', 'rejected', 'superseded'),
      allowNull: false,
    },
    title: { type: DataTypes.STRING(120), allowNull: false },
    summary: { type: DataTypes.STRING(280), allowNull: false },
    description_md: { type: DataTypes.TEXT, allowNull: false },
    description_html: { type: DataTypes.TEXT, allowNull: false },
    category: { type: DataTypes.STRING(40), allowNull: false },
    licence: { type: DataTypes.STRING(40), allowNull: false },
    mounts: { type: DataTypes.TEXT, allowNull: false },
    key_dimensions: { type: DataTypes.TEXT, allowNull: false },
    carries_load: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    overhead: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    vehicle: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    heat: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    tested_load_kg: { type: DataTypes.DECIMAL(7, 2), allowNull: true },
    created_by: fk('users', 'RESTRICT'),
    submitted_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('part_revisions', ['part_id', 'number'], { unique: true });
  await q.addIndex('part_revisions', ['status', 'submitted_at']);

  await q.createTable('revision_bodies', {
    revision_id: { ...fk('part_revisions'), primaryKey: true },
    body_id: { ...fk('camera_bodies', 'RESTRICT'), primaryKey: true },
  });

  await q.createTable('recipes', {
    id,
    revision_id: fk('part_revisions'),
    position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    purpose: { type: DataTypes.ENUM('fit-test', 'set-ready'), allowNull: false },
    material: { type: DataTypes.STRING(20), allowNull: false },
    nozzle_mm: { type: DataTypes.DECIMAL(4, 2), allowNull: false },
    layer_mm: { type: DataTypes.DECIMAL(4, 3), allowNull: false },
    walls: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    top_bottom_layers: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    infill_pct: { type: DataTypes.DECIMAL(5, 2), allowNull: false },
    infill_pattern: { type: DataTypes.STRING(20), allowNull: false },
    hotend_c: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    bed_c: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    speed_mm_s: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    supports: { type: DataTypes.ENUM('none', 'bed-only', 'everywhere'), allowNull: false },
    orientation_note: { type: DataTypes.STRING(500), allowNull: true },
    printer_bed_mm: { type: DataTypes.STRING(60), allowNull: true },
    result_notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });

  await q.createTable('part_files', {
    id,
    part_id: fk('parts'),
    kind: { type: DataTypes.ENUM('model', 'photo', 'source'), allowNull: false },
    stored_name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
    original_name: { type: DataTypes.STRING(200), allowNull: false },
    mime: { type: DataTypes.STRING(100), allowNull: false },
    size_bytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    format: { type: DataTypes.STRING(20), allowNull: true },
    analysis: { type: DataTypes.TEXT, allowNull: true },
    processing: { type: DataTypes.ENUM('ready', 'pending', 'failed'), allowNull: false, defaultValue: 'ready' },
    width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    created_by: fk('users', 'RESTRICT'),
    ...timestamps,
  });
  await q.addIndex('part_files', ['part_id', 'kind']);

  await q.createTable('revision_files', {
    revision_id: { ...fk('part_revisions'), primaryKey: true },
    file_id: { ...fk('part_files'), primaryKey: true },
    position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
  });
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const table of ['revision_files', 'part_files', 'recipes', 'revision_bodies', 'part_revisions', 'parts', 'camera_bodies']) {
    await q.dropTable(table);
  }
};
