// Versioned migrations through umzug. Each file exports `up` and `down`; the database records which
// ran, so every step runs once. The demo seeders (server/demo/) run through `runSteps` too.
import { randomBytes } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { hostname } from 'node:os';
import { resolve } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { QueryTypes, type QueryInterface, type Sequelize } from 'sequelize';
import { isRetriableTransactionError } from './errors';
import { SequelizeStorage, Umzug } from 'umzug';

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}

export type MigrationFn<C extends MigrationContext = MigrationContext> = (ctx: { context: C }) => Promise<void>;

function stepsIn<C extends MigrationContext>(dir: string) {
  return readdirSync(dir)
    .filter((f) => /^\d{4}-[\w-]+\.(ts|js)$/.test(f))
    .sort()
    .map((file) => {
      const load = () => import(resolve(dir, file)) as Promise<{ up: MigrationFn<C>; down?: MigrationFn<C> }>;
      return {
        name: file.replace(/\.(ts|js)$/, ''), // the same name from the sources and from dist-server/
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

/** A migration lease not renewed for this long (its instance died mid-migration) can be taken over. */
const MIGRATION_LEASE_S = 120;

/**
 * Runs `work` while holding the one row of schema_migration_lock, so that of N instances starting
 * at once only one migrates (or seeds) and the others wait, then find nothing left to do. A
 * conditional UPDATE of a leased row rather than a table lock or GET_LOCK, which a Galera cluster
 * does not share between nodes: there two nodes taking the row at once conflict at commit and one
 * of them gets a deadlock error, which counts as "not taken". The lease is renewed while the work
 * runs and taken over when its holder stops renewing it.
 */
export async function withSchemaLock<T>(
  sequelize: Sequelize,
  work: () => Promise<T>,
  log: (line: string) => void = (l) => console.log(`rigshelf: ${l}`),
): Promise<T> {
  await sequelize.query(
    'CREATE TABLE IF NOT EXISTS schema_migration_lock (id TINYINT UNSIGNED NOT NULL PRIMARY KEY, holder VARCHAR(100) NULL, lease_until DATETIME(3) NULL)',
  );
  await sequelize.query('INSERT IGNORE INTO schema_migration_lock (id, holder, lease_until) VALUES (1, NULL, NULL)');
  const me = `${hostname()}:${process.pid}:${randomBytes(4).toString('hex')}`;
  const take = async () => {
    try {
      const [, affected] = await sequelize.query(
        'UPDATE schema_migration_lock SET holder = :me, lease_until = NOW(3) + INTERVAL :s SECOND WHERE id = 1 AND (holder IS NULL OR holder = :me OR lease_until < NOW(3))',
        { replacements: { me, s: MIGRATION_LEASE_S }, type: QueryTypes.UPDATE },
      );
      return affected > 0;
    } catch (err) {
      if (isRetriableTransactionError(err)) return false;
      throw err;
    }
  };
  let said = false;
  while (!(await take())) {
    if (!said) log('another instance is migrating the database; waiting for it');
    said = true;
    await sleep(300 + Math.random() * 400);
  }
  const renew = setInterval(() => void take().catch(() => undefined), (MIGRATION_LEASE_S * 1000) / 4);
  renew.unref();
  try {
    return await work();
  } finally {
    clearInterval(renew);
    await sequelize
      .query('UPDATE schema_migration_lock SET holder = NULL, lease_until = NULL WHERE id = 1 AND holder = :me', { replacements: { me } })
      .catch(() => undefined);
  }
}

function migrations(sequelize: Sequelize) {
  return runSteps(resolve(import.meta.dirname, 'migrations'), 'schema_migrations', { queryInterface: sequelize.getQueryInterface(), sequelize });
}

export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await withSchemaLock(sequelize, () => migrations(sequelize).up());
  return done.map((m) => m.name);
}

export async function rollbackAll(sequelize: Sequelize): Promise<void> {
  await migrations(sequelize).down({ to: 0 });
}
