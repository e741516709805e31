// Versioned migrations and seeders through umzug. Each file exports `up` (and `down` for
// migrations); the database records which ran, so every step runs once.
import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}

export type MigrationFn = (ctx: { context: MigrationContext }) => Promise<void>;

function stepsIn(folder: string) {
  const dir = resolve(import.meta.dirname, folder);
  return readdirSync(dir)
    .filter((f) => /^\d{4}-[\w-]+\.ts$/.test(f))
    .sort()
    .map((file) => {
      const load = () => import(resolve(dir, file)) as Promise<{ up: MigrationFn; down?: MigrationFn }>;
      return {
        name: file.replace(/\.ts$/, ''),
        up: async (params: { context: MigrationContext }) => (await load()).up(params),
        down: async (params: { context: MigrationContext }) => (await load()).down?.(params),
      };
    });
}

function umzug(sequelize: Sequelize, folder: string, tableName: string) {
  return new Umzug<MigrationContext>({
    migrations: stepsIn(folder),
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize, tableName, modelName: tableName }),
    logger: undefined,
  });
}

export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await umzug(sequelize, 'migrations', 'schema_migrations').up();
  return done.map((m) => m.name);
}

export async function rollbackAll(sequelize: Sequelize): Promise<void> {
  await umzug(sequelize, 'migrations', 'schema_migrations').down({ to: 0 });
}

/** Runs the demo seeders that have not run on this database yet. */
export async function seedDemo(sequelize: Sequelize): Promise<string[]> {
  const done = await umzug(sequelize, 'seeders', 'schema_seeds').up();
  return done.map((m) => m.name);
}
