// `npm run dev`: the API on PORT (MariaDB as for `npm start`) and Vite's dev server proxying /api to it.
import { spawn } from 'node:child_process';
import { resolve } from 'node:path';
import { loadConfig } from '../config';
import { closeOnSignals, startServer } from '../index';
import { localInstance, root } from './local-env';

const { db, env } = localInstance('app');
Object.assign(process.env, env);
// people open Vite's server in development, so links in mails point there
process.env.PUBLIC_URL ??= 'http://127.0.0.1:5173';
const config = loadConfig();
await db.start();
await db.provision({ database: config.DB_NAME, user: config.DB_USER, password: config.DB_PASSWORD });
const running = await startServer(config);
console.log(`rigshelf: API on ${running.url}`);

const vite = spawn(resolve(root, 'node_modules/.bin/vite'), [], {
  cwd: root,
  stdio: 'inherit',
  env: { ...process.env, RIGSHELF_API: running.url },
});
closeOnSignals(running, async () => {
  vite.kill('SIGTERM');
  await db.stop();
});
