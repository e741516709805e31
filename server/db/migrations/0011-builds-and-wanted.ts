// Members' camera builds (body, mounts, key sizes) and wanted parts: requests for a part nobody has
// put on the shelf yet, their photos or sketches, and the parts offered in answer.
import { DataTypes } from 'sequelize';
import type { MigrationFn } from '../migrator';
import { id, ref, timestamps } from '../migration-columns';

export const up: MigrationFn = async ({ context: { queryInterface: q } }) => {
  await q.createTable('builds', {
    id,
    owner_id: ref('users'),
    name: { type: DataTypes.STRING(80), allowNull: false },
    body_id: ref('camera_bodies', 'SET NULL', true),
    mounts: { type: DataTypes.TEXT, allowNull: false },
    key_sizes: { type: DataTypes.TEXT, allowNull: false },
    ...timestamps,
  });
  await q.addIndex('builds', ['owner_id']);

  await q.createTable('wanted_requests', {
    id,
    author_id: ref('users'),
    title: { type: DataTypes.STRING(120), allowNull: false },
    details: { type: DataTypes.TEXT, allowNull: false },
    body_id: ref('camera_bodies', 'SET NULL', true),
    mounts: { type: DataTypes.TEXT, allowNull: false },
    key_sizes: { type: DataTypes.TEXT, allowNull: false },
    needed_by: { type: DataTypes.DATEONLY, allowNull: true },
    searched_for: { type: DataTypes.STRING(200), allowNull: true },
    status: { type: DataTypes.ENUM('open', 'closed'), allowNull: false, defaultValue: 'open' },
    close_reason: { type: DataTypes.ENUM('solved', 'withdrawn', 'spam'), allowNull: true },
    close_note: { type: DataTypes.STRING(500), allowNull: true },
    closed_at: { type: DataTypes.DATE, allowNull: true },
    closed_by: ref('users', 'SET NULL', true),
    ...timestamps,
  });
  await q.addIndex('wanted_requests', ['status', 'created_at']);
  await q.addIndex('wanted_requests', ['author_id']);

  await q.createTable('wanted_photos', {
    id,
    request_id: ref('wanted_requests'),
    stored_name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
    original_name: { type: DataTypes.STRING(200), allowNull: false },
    size_bytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    processing: { type: DataTypes.ENUM('ready', 'pending', 'failed'), allowNull: false, defaultValue: 'pending' },
    processing_attempts: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 },
    width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('wanted_photos', ['request_id']);

  await q.createTable('wanted_answers', {
    id,
    request_id: ref('wanted_requests'),
    part_id: ref('parts'),
    user_id: ref('users'),
    note: { type: DataTypes.STRING(1000), allowNull: false },
    // when the requester was told the part is on the shelf (once per answer)
    notified_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('wanted_answers', ['request_id', 'part_id'], { unique: true });
  await q.addIndex('wanted_answers', ['part_id']);
};

export const down: MigrationFn = async ({ context: { queryInterface: q } }) => {
  for (const table of ['wanted_answers', 'wanted_photos', 'wanted_requests', 'builds']) await q.dropTable(table);
};
