// The first connection at start-up: MariaDB may still be starting (or restarting), so the server
// waits for it with backoff and says so, and gives up after a stated time with one clear line.
import { AccessDeniedError, ConnectionError, type Sequelize } from 'sequelize';

/** A start-up failure whose message is the whole story: printed as one line, without a stack. */
export class StartupError extends Error {
  override name = 'StartupError';
}

// Codes that mean "the server is not there or not ready yet"; anything else (wrong password, no
// such database) will not get better by waiting.
const NOT_YET = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'ENOTFOUND',
  'EAI_AGAIN',
  'EPIPE',
  'ER_CONNECTION_TIMEOUT',
  'ER_SOCKET_UNEXPECTED_CLOSE',
  'ER_CON_COUNT_ERROR',
  'ER_SERVER_SHUTDOWN',
  'ER_SERVER_ISNT_AVAILABLE',
]);

function codeOf(err: unknown): string | undefined {
  const e = err as { parent?: { code?: string }; original?: { code?: string }; code?: string };
  return e?.parent?.code ?? e?.original?.code ?? e?.code;
}

function isTransient(err: unknown): boolean {
  if (err instanceof AccessDeniedError) return false;
  const code = codeOf(err);
  if (code) return NOT_YET.has(code);
  return err instanceof ConnectionError;
}

function brief(err: unknown): string {
  const code = codeOf(err);
  const message = (err instanceof Error ? err.message : String(err)).split('\n')[0].replace(/^\(conn=[^)]*\)\s*/, '');
  return code && !message.includes(code) ? `${code}: ${message}` : message;
}

export interface WaitOptions {
  host: string;
  port: number;
  /** How the database is named in messages (default host:port; DB_HOSTS lists several). */
  address?: string;
  /** Give up after this many seconds. */
  waitSeconds: number;
  log?: (line: string) => void;
  /** Pause between attempts grows from this, doubling up to 5 s (with jitter). */
  firstDelayMs?: number;
}

export async function waitForDatabase(sequelize: Sequelize, options: WaitOptions): Promise<void> {
  const { waitSeconds } = options;
  const where = options.address ?? `${options.host}:${options.port}`;
  const log = options.log ?? ((line) => console.log(`rigshelf: ${line}`));
  const giveUpAt = Date.now() + waitSeconds * 1000;
  let delay = options.firstDelayMs ?? 250;
  let waiting = false;
  for (;;) {
    try {
      await sequelize.authenticate();
      if (waiting) log(`MariaDB at ${where} is up`);
      return;
    } catch (err) {
      if (!isTransient(err)) throw new StartupError(`cannot use MariaDB at ${where}: ${brief(err)} (check DB_USER, DB_PASSWORD and DB_NAME)`);
      if (Date.now() + delay > giveUpAt) {
        throw new StartupError(
          `MariaDB at ${where} did not answer within ${waitSeconds} s (${brief(err)}); start it (npm start does) or check DB_HOST and DB_PORT (or DB_HOSTS)`,
        );
      }
      if (!waiting) {
        log(`waiting for MariaDB at ${where}… (giving up after ${waitSeconds} s)`);
        waiting = true;
      }
      await new Promise((r) => setTimeout(r, delay * (0.75 + Math.random() * 0.5)));
      delay = Math.min(delay * 2, 5000);
    }
  }
}
