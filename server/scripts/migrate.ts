// `npm run migrate`: applies pending migrations to the database named by the environment
// (or the local `npm start` instance when none is given).
import { loadConfig } from '../config';
import { migrate } from '../db/migrator';
import { createSequelize } from '../db/sequelize';
import { localInstance } from './local-env';

const { db, env } = localInstance('app');
const local = !process.env.DB_PASSWORD;
if (local) {
  Object.assign(process.env, env);
  await db.start();
}
const config = loadConfig();
if (local) await db.provision({ database: config.DB_NAME, user: config.DB_USER, password: config.DB_PASSWORD });
const sequelize = createSequelize(config);
const done = await migrate(sequelize);
console.log(done.length ? `applied: ${done.join(', ')}` : 'nothing to apply');
await sequelize.close();
