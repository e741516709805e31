// The demo shelf: numbered seeders (NNNN-name.ts, beside this file) that go through the running
// app's services, so demo data obeys the real rules. They live outside server/db/ because they use
// the services, and the database layer must not.
import type { Sequelize } from 'sequelize';
import { runSteps, withSchemaLock, type MigrationContext, type MigrationFn } from '../db/migrator';
import type { EvidenceService } from '../modules/evidence/service';
import type { UploadDirs } from '../modules/files/storage';
import type { PartsService } from '../modules/parts/service';
import type { PrintRequestsService } from '../modules/print-requests/service';
import type { ReviewService } from '../modules/review/service';

export interface SeedServices {
  parts: PartsService;
  review: ReviewService;
  evidence: EvidenceService;
  dirs: UploadDirs;
  printRequests?: PrintRequestsService;
}

export interface SeedContext extends MigrationContext {
  /** The running app's services, for demo data that goes through the real rules. */
  services?: SeedServices;
}

export type SeedFn = MigrationFn<SeedContext>;

/** Runs the demo seeders that have not run on this database yet (up to and including `to`, a seeder's name). */
export async function seedDemo(sequelize: Sequelize, services: SeedServices, options: { to?: string } = {}): Promise<string[]> {
  const seeders = runSteps<SeedContext>(import.meta.dirname, 'schema_seeds', { queryInterface: sequelize.getQueryInterface(), sequelize, services });
  const done = await withSchemaLock(sequelize, () => seeders.up(options.to ? { to: options.to } : {}));
  return done.map((m) => m.name);
}
