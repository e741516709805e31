// Versioned migrations through umzug. Each file exports `up` and `down`; the database records which
// ran, so every step runs once. The demo seeders (server/demo/) run through `runSteps` too.
import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}

export type MigrationFn<C extends MigrationContext = MigrationContext> = (ctx: { context: C }) => Promise<void>;

function stepsIn<C extends MigrationContext>(dir: string) {
  return readdirSync(dir)
    .filter((f) => /^\d{4}-[\w-]+\.ts$/.test(f))
    .sort()
    .map((file) => {
      const load = () => import(resolve(dir, file)) as Promise<{ up: MigrationFn<C>; down?: MigrationFn<C> }>;
      return {
        name: file.replace(/\.ts$/, ''),
        up: async (params: { context: C }) => (await load()).up(params),
        down: async (params: { context: C }) => (await load()).down?.(params),
      };
    });
}

/** The numbered steps (`NNNN-name.ts`) in `dir`, recorded in `tableName`, run with `context`. */
export function runSteps<C extends MigrationContext>(dir: string, tableName: string, context: C) {
  return new Umzug<C>({
    migrations: stepsIn<C>(dir),
    context,
    storage: new SequelizeStorage({ sequelize: context.sequelize, tableName, modelName: tableName }),
    logger: undefined,
  });
}

function migrations(sequelize: Sequelize) {
  return runSteps(resolve(import.meta.dirname, 'migrations'), 'schema_migrations', { queryInterface: sequelize.getQueryInterface(), sequelize });
}

export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await migrations(sequelize).up();
  return done.map((m) => m.name);
}

export async function rollbackAll(sequelize: Sequelize): Promise<void> {
  await migrations(sequelize).down({ to: 0 });
}
