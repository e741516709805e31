// `npm start`: private MariaDB on loopback, migrations, demo seed on first run, client build, serve.
import { loadConfig } from '../config';
import { closeOnSignals, startServer } from '../index';
import { ensureClientBuilt } from './build-client';
import { localInstance } from './local-env';

const { db, env } = localInstance('app');
Object.assign(process.env, env);
const config = loadConfig();

await db.start();
await db.provision({ database: config.DB_NAME, user: config.DB_USER, password: config.DB_PASSWORD });
ensureClientBuilt();

const running = await startServer(config);
console.log(`rigshelf: serving ${running.url}  (Ctrl-C stops the app, then MariaDB)`);
closeOnSignals(running, () => db.stop());
