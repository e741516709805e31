// Starts Rigshelf: connect, migrate, seed (demo only), listen; closes in order on SIGINT/SIGTERM.
import { createServer, type Server } from 'node:http';
import { resolve } from 'node:path';
import { createApp } from './app';
import { loadConfig, type Config } from './config';
import { migrate, seedDemo } from './db/migrator';
import { createSequelize } from './db/sequelize';
import { createMailer } from './modules/mail/outbox';

export interface RunningServer {
  server: Server;
  url: string;
  close(): Promise<void>;
}

export async function startServer(config: Config): Promise<RunningServer> {
  for (const warning of config.warnings) console.warn(`rigshelf: warning: ${warning}`);
  const sequelize = createSequelize(config);
  await sequelize.authenticate();
  const migrations = await migrate(sequelize);
  if (migrations.length) console.log(`rigshelf: migrations applied: ${migrations.join(', ')}`);

  const mailer = await createMailer({ config, sequelize });
  if (mailer.fake) {
    console.log(`rigshelf: local fake SMTP server on ${mailer.fake.host}:${mailer.fake.port} (admins read it at /api/dev/mailbox)`);
  }
  const built = createApp({ config, sequelize, mailer });
  const recovered = await built.services.parts.recover();
  if (recovered.removed || recovered.resumed) {
    console.log(`rigshelf: upload sweep removed ${recovered.removed} orphaned file(s), resumed ${recovered.resumed} photo(s)`);
  }
  if (config.seedDemo) {
    const seeds = await seedDemo(sequelize, built.services);
    if (seeds.length) console.log(`rigshelf: demo scenario seeded (${seeds.join(', ')})`);
  }
  // after the seed: a seeded shelf no longer matches the saved index's fingerprint, so it is rebuilt
  const search = await built.services.search.start();
  console.log(`rigshelf: search index ${search.rebuiltBecause ? `built (${search.rebuiltBecause})` : 'loaded'}, ${search.documents} part(s)`);
  const server = createServer(built.app);
  try {
    await new Promise<void>((resolveListen, reject) => {
      server.once('error', reject);
      server.listen(config.PORT, config.HOST, () => resolveListen());
    });
  } catch (err) {
    await mailer.close();
    throw err;
  }
  mailer.start();
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;
  const url = `http://${config.HOST}:${port}`;

  return {
    server,
    url,
    async close() {
      await new Promise<void>((r) => {
        server.close(() => r());
        server.closeIdleConnections();
      });
      await built.close();
      await mailer.close();
      await sequelize.close();
    },
  };
}

/** Closes the HTTP server, then the mail loop, then the DB pool, then whatever `after` stops (MariaDB under `npm start`). */
export function closeOnSignals(running: RunningServer, after?: () => Promise<void>) {
  let closing = false;
  const shutdown = async (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`rigshelf: ${signal} received, shutting down`);
    try {
      await running.close();
      await after?.();
      process.exit(0);
    } catch (err) {
      console.error(err);
      process.exit(1);
    }
  };
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  const running = await startServer(loadConfig());
  console.log(`rigshelf: serving ${running.url}`);
  closeOnSignals(running);
}
