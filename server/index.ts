// Starts Rigshelf: connect (waiting for MariaDB), migrate, seed (demo only), listen; on SIGINT/SIGTERM
// drains HTTP and closes in order within SHUTDOWN_TIMEOUT_S.
import { createServer, type Server } from 'node:http';
import { resolve } from 'node:path';
import { createApp } from './app';
import { loadConfig, type Config } from './config';
import { migrate } from './db/migrator';
import { seedDemo } from './demo/seed';
import { createSequelize, databaseAddress } from './db/sequelize';
import { StartupError, waitForDatabase } from './db/wait';
import { logLoopLag } from './loop-lag';
import { trackConnections } from './shutdown';
import { createMailer } from './modules/mail/outbox';
import { keepRunningOnUnhandledRejections } from './process-safety';

export interface RunningServer {
  server: Server;
  url: string;
  /** The whole shutdown (drain, workers, pool, and what the caller stops after) must fit in this. */
  shutdownTimeoutMs: number;
  /**
   * Stops accepting, lets requests in flight finish for up to `drainMs` (default: the shutdown
   * timeout less a reserve for what follows), then closes workers, the mail loop and the pool.
   */
  close(options?: { drainMs?: number }): Promise<void>;
}

/** With other instances up, the start-up sweep removes only files untouched for this long. */
export const SWEEP_GRACE_WITH_OTHERS_MS = 60 * 60_000;

/** Time left for requests in flight: the shutdown timeout less up to 3 s for closing the rest. */
export function drainBudgetMs(shutdownTimeoutMs: number): number {
  return shutdownTimeoutMs - Math.min(3000, shutdownTimeoutMs * 0.3);
}

export async function startServer(config: Config): Promise<RunningServer> {
  for (const warning of config.warnings) console.warn(`rigshelf: warning: ${warning}`);
  keepRunningOnUnhandledRejections();
  const sequelize = createSequelize(config);
  await waitForDatabase(sequelize, { host: config.DB_HOST, port: config.DB_PORT, address: databaseAddress(config), waitSeconds: config.DB_WAIT_S });
  const migrations = await migrate(sequelize);
  if (migrations.length) console.log(`rigshelf: migrations applied: ${migrations.join(', ')}`);

  const mailer = await createMailer({ config, sequelize });
  if (mailer.fake) {
    console.log(`rigshelf: local fake SMTP server on ${mailer.fake.host}:${mailer.fake.port} (admins read it at /api/dev/mailbox)`);
  }
  const built = createApp({ config, sequelize, mailer });
  const payFake = await built.services.payments.fake();
  // Files another instance is writing right now are newer than this process; with other instances
  // up, the sweep leaves anything from the last hour alone (an upload and its commit take seconds).
  await built.services.jobs.announce();
  const sweep = async () => {
    const others = await built.services.claims.othersAlive();
    const minAgeMs = others ? SWEEP_GRACE_WITH_OTHERS_MS : Math.max(0, Date.now() - performance.timeOrigin);
    if (!others) await built.services.claims.expireOthers();
    const recovered = await built.services.parts.recover({ minAgeMs });
    if (recovered.removed || recovered.resumed) {
      console.log(`rigshelf: upload sweep removed ${recovered.removed} orphaned file(s), resumed ${recovered.resumed} photo(s)`);
    }
    if (recovered.pictures) console.log(`rigshelf: drawing the picture of ${recovered.pictures} model(s) in the background`);
  };
  try {
    await sweep();
  } catch (err) {
    // a store that is away (or a listing it refuses) must not keep the shelf from starting
    console.error(`rigshelf: start-up sweep could not finish (${err instanceof Error ? err.message : String(err)}); the job loop tries it again`);
    built.services.jobs.later('startup-sweep', sweep);
  }
  if (config.seedDemo) {
    const started = performance.now();
    const seeds = await seedDemo(sequelize, built.services);
    if (seeds.length) console.log(`rigshelf: demo scenario seeded in ${((performance.now() - started) / 1000).toFixed(1)} s (${seeds.join(', ')})`);
  }
  // after the seed: a seeded shelf no longer matches the saved index's fingerprint, so it is rebuilt
  const search = await built.services.search.start();
  console.log(`rigshelf: search index ${search.rebuiltBecause ? `built (${search.rebuiltBecause})` : 'loaded'}, ${search.documents} part(s)`);
  const server = createServer(built.app);
  const http = trackConnections(server);
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
  // after listen: the job loop's first round tries due refunds, and the payments fake's webhook needs us up
  built.services.jobs.start();
  const lag = config.LOOP_LAG_LOG_S ? logLoopLag(config.LOOP_LAG_LOG_S) : null;
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;
  const url = `http://${config.HOST}:${port}`;
  // on a free port (PORT=0) the default public address is only known now
  if (config.PUBLIC_URL.endsWith(':0')) built.services.printRequests.useBaseUrl(url);
  if (payFake && config.PAYMENTS_WEBHOOK_URL.includes(':0/')) payFake.webhookUrl = `${url}/api/payments/webhook`;
  if (payFake) console.log(`rigshelf: local payments fake on ${payFake.url} (the SDK talks to it; webhooks go to ${payFake.webhookUrl})`);

  const shutdownTimeoutMs = config.SHUTDOWN_TIMEOUT_S * 1000;

  return {
    server,
    url,
    shutdownTimeoutMs,
    async close(options = {}) {
      const drainMs = options.drainMs ?? drainBudgetMs(shutdownTimeoutMs);
      const busy = http.inFlight;
      const clean = await http.drain(drainMs);
      if (!clean) console.log(`rigshelf: requests still open after ${(drainMs / 1000).toFixed(1)} s; their connections were closed`);
      else if (busy) console.log(`rigshelf: ${busy} request(s) in flight finished`);
      lag?.stop();
      await built.close();
      await mailer.close();
      await sequelize.close();
    },
  };
}

/**
 * On SIGINT/SIGTERM: drains HTTP, closes the mail loop and the DB pool, then runs `after` (stopping
 * MariaDB under `npm start`). Exits within the server's shutdown timeout whatever is still open.
 */
export function closeOnSignals(running: RunningServer, after?: () => Promise<void>) {
  let closing = false;
  const shutdown = async (signal: string) => {
    if (closing) return;
    closing = true;
    const began = Date.now();
    const limit = running.shutdownTimeoutMs;
    console.log(`rigshelf: ${signal} received, shutting down (at most ${limit / 1000} s)`);
    setTimeout(() => {
      console.error(`rigshelf: shutdown did not finish within ${limit / 1000} s; exiting anyway`);
      process.exit(1);
    }, limit).unref();
    try {
      await running.close();
      await after?.();
      console.log(`rigshelf: stopped in ${((Date.now() - began) / 1000).toFixed(1)} s`);
      process.exit(0);
    } catch (err) {
      console.error(`rigshelf: shutdown failed: ${err instanceof Error ? err.message : String(err)}`);
      process.exit(1);
    }
  };
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

/** One line for a failed start: the message a person can act on, no stack (StartupError and config errors carry it all). */
export function startFailure(err: unknown): string {
  if (err instanceof StartupError) return `rigshelf: ${err.message}`;
  const message = err instanceof Error ? err.message : String(err);
  return `rigshelf: could not start: ${message}`;
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  let running: RunningServer;
  try {
    running = await startServer(loadConfig());
  } catch (err) {
    console.error(startFailure(err));
    process.exit(1);
  }
  console.log(`rigshelf: serving ${running.url}`);
  closeOnSignals(running);
}
