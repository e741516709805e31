// Versioned migrations and seeders through umzug. Each file exports `up` (and `down` for
// migrations); the database records which ran, so every step runs once.
import { readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import type { UploadDirs } from '../modules/files/storage';
import type { EvidenceService } from '../modules/evidence/service';
import type { PartsService } from '../modules/parts/service';
import type { ReviewService } from '../modules/review/service';
import type { PrintRequestsService } from '../modules/print-requests/service';

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
  /** Seeders only: the running app's services, for demo data that goes through the real rules. */
  services?: SeedServices;
}

export interface SeedServices {
  parts: PartsService;
  review: ReviewService;
  evidence: EvidenceService;
  dirs: UploadDirs;
  printRequests?: PrintRequestsService;
}

export type MigrationFn = (ctx: { context: MigrationContext }) => Promise<void>;

function stepsIn(folder: string) {
  const dir = resolve(import.meta.dirname, folder);
  return readdirSync(dir)
    .filter((f) => /^\d{4}-[\w-]+\.(ts|js)$/.test(f))
    .sort()
    .map((file) => {
      const load = () => import(resolve(dir, file)) as Promise<{ up: MigrationFn; down?: MigrationFn }>;
      return {
        name: file.replace(/\.(ts|js)$/, ''), // the same name from the sources and from dist-server/
        up: async (params: { context: MigrationContext }) => (await load()).up(params),
        down: async (params: { context: MigrationContext }) => (await load()).down?.(params),
      };
    });
}

function umzug(sequelize: Sequelize, folder: string, tableName: string, services?: SeedServices) {
  return new Umzug<MigrationContext>({
    migrations: stepsIn(folder),
    context: { queryInterface: sequelize.getQueryInterface(), sequelize, services },
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

/** Runs the demo seeders that have not run on this database yet (up to and including `to`, a seeder's name). */
export async function seedDemo(sequelize: Sequelize, services: SeedServices, options: { to?: string } = {}): Promise<string[]> {
  const done = await umzug(sequelize, 'seeders', 'schema_seeds', services).up(options.to ? { to: options.to } : {});
  return done.map((m) => m.name);
}
