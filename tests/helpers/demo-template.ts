// Seeding the demo shelf costs 10–20 s of CPU, and about twenty test files want it. Within one
// `npm test` run (RIGSHELF_TEST_RUN, set by server/scripts/test.ts) the first file that wants a
// kind seeds it once into a template database and folder; every file then gets a copy of its rows
// and files in about a second. The copy is the same data the seed would have written: the seeders'
// own table comes with it, so seedDemo afterwards finds nothing left to run.
import { cpSync, mkdirSync, rmSync } from 'node:fs';
import { createConnection, type Connection } from 'mariadb';
import type { Sequelize } from 'sequelize';
import { createApp } from '../../server/app';
import type { Config } from '../../server/config';
import { migrate } from '../../server/db/migrator';
import { createSequelize } from '../../server/db/sequelize';
import { seedDemo } from '../../server/demo/seed';
import { createMailer } from '../../server/modules/mail/outbox';
import { rebindModels, testConfig } from './app';
import { templateDatabase, templateFolder, type DemoKind } from '../../server/scripts/test-templates';

const READY_TABLE = 'template_ready';

/** How far seedDemo goes for a kind: the scenario ends with the builds and wanted seeder. */
export function seedOptions(kind: DemoKind): { to?: string } {
  return kind === 'full' ? {} : { to: '0011-demo-builds-and-wanted' };
}

function connect(): Promise<Connection> {
  return createConnection({ host: process.env.DB_HOST, port: Number(process.env.DB_PORT), user: process.env.DB_USER, password: process.env.DB_PASSWORD });
}

async function seedTemplate(kind: DemoKind, database: string, folder: string) {
  rmSync(folder, { recursive: true, force: true });
  mkdirSync(folder, { recursive: true });
  const config = testConfig({ DB_NAME: database, UPLOADS_DIR: folder });
  let sequelize: Sequelize | null = null;
  try {
    sequelize = createSequelize(config);
    await migrate(sequelize);
    const mailer = await createMailer({ config, sequelize });
    const built = createApp({ config, sequelize, mailer });
    try {
      await seedDemo(sequelize, built.services, seedOptions(kind));
    } finally {
      await built.close();
      await mailer.close();
    }
  } finally {
    await sequelize?.close();
    // the models were bound to the template's connection; give them back to the file's own app
    rebindModels();
  }
}

/**
 * Copies the demo of `kind` into the database and upload folder of `config` (a test app's, still
 * empty), seeding the template first if no file of this run has. Returns false, copying nothing,
 * outside `npm test` (no run id), with files kept in S3, or when the database has tables already
 * (a second app in one file): the caller's seedDemo then does the work as before.
 */
export async function copyDemo(kind: DemoKind, config: Config): Promise<boolean> {
  const run = process.env.RIGSHELF_TEST_RUN;
  if (!run || config.STORAGE !== 'local') return false;
  const target = { database: config.DB_NAME, uploadsDir: config.UPLOADS_DIR };
  const template = templateDatabase(run, kind);
  const folder = templateFolder(run, kind);
  const conn = await connect();
  try {
    const [existing] = await conn.query('SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ?', [target.database]);
    if (Number(existing.n) > 0) return false;
    // one file seeds, the others (in the other worker) wait for it
    await conn.query('SELECT GET_LOCK(?, 900)', [template]);
    try {
      const [ready] = await conn.query('SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ? AND table_name = ?', [
        template,
        READY_TABLE,
      ]);
      if (Number(ready.n) === 0) {
        await conn.query(`DROP DATABASE IF EXISTS \`${template}\``);
        await conn.query(`CREATE DATABASE \`${template}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
        await seedTemplate(kind, template, folder);
        await conn.query(`CREATE TABLE \`${template}\`.\`${READY_TABLE}\` (id INT PRIMARY KEY)`);
      }
    } finally {
      await conn.query('SELECT RELEASE_LOCK(?)', [template]);
    }
    // the tables as the migrations made them (foreign keys included), then their rows
    await conn.query(`USE \`${target.database}\``);
    await conn.query('SET SESSION foreign_key_checks = 0');
    const tables = (await conn.query(
      "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = ? AND table_type = 'BASE TABLE' AND table_name <> ?",
      [template, READY_TABLE],
    )) as { name: string }[];
    for (const { name } of tables) {
      const [shown] = (await conn.query(`SHOW CREATE TABLE \`${template}\`.\`${name}\``)) as Record<string, string>[];
      await conn.query(shown['Create Table']);
      await conn.query(`INSERT INTO \`${name}\` SELECT * FROM \`${template}\`.\`${name}\``);
    }
  } finally {
    await conn.end();
  }
  cpSync(folder, target.uploadsDir, { recursive: true });
  return true;
}
