// `npm start`: private MariaDB on loopback, migrations, demo seed on first run, client build, serve.
// package.json runs this with `exec`, so a SIGTERM to npm reaches this process; whatever way it
// ends, it stops the MariaDB it runs on.
import { loadConfig } from '../config';
import { closeOnSignals, startFailure, startServer } from '../index';
import { ensureClientBuilt } from './build-client';
import { localInstance } from './local-env';

const { db, env } = localInstance('app');
Object.assign(process.env, env);

let config: ReturnType<typeof loadConfig>;
try {
  config = loadConfig();
} catch (err) {
  console.error(startFailure(err));
  process.exit(1);
}

// DB_HOSTS names external servers (a Galera cluster): no MariaDB of our own is started or stopped
if (config.DB_HOSTS) {
  db.start = async () => undefined;
  db.provision = async () => undefined;
  db.stop = async () => undefined;
  db.signalStop = () => undefined;
}

// A signal during start-up stops MariaDB too; after start-up closeOnSignals takes over.
let serving = false;
const duringStartup = (signal: NodeJS.Signals) => {
  if (serving) return;
  console.log(`rigshelf: ${signal} received while starting; stopping MariaDB`);
  void db.stop().finally(() => process.exit(1));
};
process.on('SIGINT', duringStartup);
process.on('SIGTERM', duringStartup);
// however the process ends (a crash, the shutdown deadline), MariaDB is told to stop as well
process.on('exit', () => db.signalStop());

try {
  await db.start();
  await db.provision({ database: config.DB_NAME, user: config.DB_USER, password: config.DB_PASSWORD });
  ensureClientBuilt();
} catch (err) {
  console.error(startFailure(err));
  await db.stop().catch(() => undefined);
  process.exit(1);
}

let running: Awaited<ReturnType<typeof startServer>>;
try {
  running = await startServer(config);
} catch (err) {
  console.error(startFailure(err));
  await db.stop().catch(() => undefined);
  process.exit(1);
}
serving = true;
process.off('SIGINT', duringStartup);
process.off('SIGTERM', duringStartup);
console.log(`rigshelf: serving ${running.url}  (Ctrl-C stops the app, then MariaDB)`);
closeOnSignals(running, () => db.stop());
