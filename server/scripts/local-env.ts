// Settings for the private local instances started by `npm start` and `npm test`.
// Secrets are generated once per checkout and kept in var/ (git-ignored).
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { root } from '../root';
import { PrivateMariaDb } from './mariadb';

export { root };
const varDir = resolve(root, 'var');

interface LocalSecrets {
  dbPassword: string;
  sessionSecret: string;
}

function localSecrets(): LocalSecrets {
  const file = resolve(varDir, 'secrets.json');
  if (existsSync(file)) return JSON.parse(readFileSync(file, 'utf8')) as LocalSecrets;
  mkdirSync(varDir, { recursive: true });
  const secrets = {
    dbPassword: randomBytes(18).toString('base64url'),
    sessionSecret: randomBytes(32).toString('base64url'),
  };
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

export type InstanceKind = 'app' | 'test';

/**
 * The private MariaDB for one purpose and the environment the app needs to reach it.
 * Values already in the environment win, so a developer can point elsewhere.
 */
export function localInstance(kind: InstanceKind) {
  const secrets = localSecrets();
  const defaultPort = kind === 'app' ? 3307 : 3308;
  const port = Number(process.env.DB_PORT ?? defaultPort);
  // another port gets its own data directory, so two instances can run side by side
  const dirName = `${kind === 'app' ? 'mariadb' : 'mariadb-test'}${port === defaultPort ? '' : `-${port}`}`;
  // RIGSHELF_DB_DIR puts the data directory elsewhere (the process tests use a temporary one)
  const db = new PrivateMariaDb({ dir: process.env.RIGSHELF_DB_DIR ? resolve(process.env.RIGSHELF_DB_DIR) : resolve(varDir, dirName), port });
  const env: Record<string, string> = {
    DB_HOST: '127.0.0.1',
    DB_PORT: String(port),
    DB_NAME: kind === 'app' ? 'rigshelf' : 'rigshelf_test',
    DB_USER: 'rigshelf',
    DB_PASSWORD: secrets.dbPassword,
    SESSION_SECRET: secrets.sessionSecret,
  };
  if (kind === 'app' && port !== defaultPort) {
    // a side-by-side app keeps its files and search index apart too: its start-up sweep removes
    // every stored file its own database does not know
    env.UPLOADS_DIR = resolve(varDir, `uploads-${port}`);
    env.SEARCH_INDEX_FILE = resolve(varDir, `search-index-${port}.json`);
  }
  for (const key of Object.keys(env)) {
    const given = process.env[key];
    if (given) env[key] = given;
  }
  return { db, env };
}
