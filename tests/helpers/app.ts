// Builds the real app against this test file's own database.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll } from 'vitest';
import type { Sequelize } from 'sequelize';
import { createApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { migrate } from '../../server/db/migrator';
import { seedDemo } from '../../server/demo/seed';
import { createSequelize } from '../../server/db/sequelize';
import { initModels, User } from '../../server/db/models';
import { createMailer, type Mailer } from '../../server/modules/mail/outbox';
import { hashPassword } from '../../server/security/password';
import type { Role } from '@shared/types';
import { copyDemo, seedOptions } from './demo-template';

export interface TestApp {
  app: ReturnType<typeof createApp>['app'];
  services: ReturnType<typeof createApp>['services'];
  sequelize: Sequelize;
  config: Config;
  /** The app's outbox; not started, so tests deliver with `await t.mailer.flush()` and read `t.mailer.fake!.messages()`. */
  mailer: Mailer;
  close(): Promise<void>;
}

// Each test file keeps its uploads apart, so one file's start-up sweep never sees another's files.
export const uploadsDir = mkdtempSync(join(tmpdir(), 'rigshelf-uploads-'));
afterAll(() => rmSync(uploadsDir, { recursive: true, force: true }));
const searchDir = mkdtempSync(join(tmpdir(), 'rigshelf-search-'));
let searchFiles = 0;
afterAll(() => rmSync(searchDir, { recursive: true, force: true }));

export function testConfig(overrides: Record<string, string> = {}): Config {
  return loadConfig({
    ...process.env,
    NODE_ENV: 'test',
    PASSWORD_SCRYPT_LOG_N: '12',
    UPLOADS_DIR: uploadsDir,
    // each app its own index file, unless a test passes one (a restart reads the same file)
    SEARCH_INDEX_FILE: join(searchDir, `index-${(searchFiles += 1)}.json`),
    // one local fake SMTP server per app, on a free port
    SMTP_FAKE: '1',
    SMTP_PORT: '0',
    // drawing model pictures costs seconds per model; the tests of pictures turn it back on
    MODEL_PICTURES: '0',
    ...overrides,
  });
}

// Sequelize models are classes bound to one instance; when a second app (a "restart") closes,
// the models go back to the app that is still open.
const open: Sequelize[] = [];
export function rebindModels() {
  if (open.length) initModels(open[open.length - 1]);
}

/**
 * `demo: true` seeds the demo scenario the demo tests were written against (seeders up to 0011);
 * `demo: 'full'` seeds the whole demo shelf (slow: tens of parts through the real submission path).
 */
export async function createTestApp(overrides: Record<string, string> = {}, options: { demo?: boolean | 'full' } = {}): Promise<TestApp> {
  const config = testConfig(overrides);
  const kind = options.demo === 'full' ? 'full' : 'scenario';
  // a copy of the run's seeded demo, when there is one, stands in for the seed
  const copied = options.demo ? await copyDemo(kind, config) : false;
  const sequelize = createSequelize(config);
  await migrate(sequelize);
  const mailer = await createMailer({ config, sequelize });
  const built = createApp({ config, sequelize, mailer });
  if (options.demo && !copied) await seedDemo(sequelize, built.services, seedOptions(kind));
  await built.services.search.start();
  open.push(sequelize);
  return {
    app: built.app,
    services: built.services,
    sequelize,
    config,
    mailer,
    async close() {
      await built.close();
      await mailer.close();
      await sequelize.close();
      open.splice(open.indexOf(sequelize), 1);
      rebindModels();
    },
  };
}

let counter = 0;
export async function makeUser(role: Role = 'member', extra: Partial<{ status: 'active' | 'suspended'; password: string }> = {}) {
  counter += 1;
  const password = extra.password ?? 'correct horse battery';
  const user = await User.create({
    email: `${role}-${counter}-${Date.now()}@crew.test`,
    displayName: `Test ${role} ${counter}`,
    passwordHash: await hashPassword(password, 12),
    role,
    status: extra.status ?? 'active',
    crewRole: null,
    emailVerifiedAt: new Date(),
  });
  return { user, email: user.email, password };
}

/** A supertest agent that keeps cookies and sends the CSRF token on every state-changing call. */
export async function agentFor(app: TestApp['app']) {
  const agent = request.agent(app);
  let token = '';
  const refresh = async () => {
    const res = await agent.get('/api/auth/csrf').expect(200);
    token = res.body.csrfToken;
    return token;
  };
  await refresh();
  return {
    agent,
    refresh,
    get token() {
      return token;
    },
    get: (url: string) => agent.get(url),
    post: (url: string) => agent.post(url).set('X-CSRF-Token', token),
    patch: (url: string) => agent.patch(url).set('X-CSRF-Token', token),
    delete: (url: string) => agent.delete(url).set('X-CSRF-Token', token),
    async login(email: string, password: string) {
      const res = await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email, password });
      if (res.status === 200) await refresh();
      return res;
    },
  };
}
