// Telling database failures apart by what the mariadb connector reports (errno, sqlState, code),
// looked up on the Sequelize error's `original` (or `parent`) or on the connector's error itself.

const DEADLOCK = 1213; // ER_LOCK_DEADLOCK, also what Galera reports for a certification conflict
const LOCK_WAIT_TIMEOUT = 1205; // ER_LOCK_WAIT_TIMEOUT
const UNKNOWN_COM = 1047; // ER_UNKNOWN_COM_ERROR: "WSREP has not yet prepared node for application use"
const ERROR_DURING_COMMIT = 1180; // ER_ERROR_DURING_COMMIT, retriable when Galera is the cause

interface DriverError {
  code?: string;
  errno?: number;
  sqlState?: string;
  message?: string;
  original?: DriverError;
  parent?: DriverError;
}

/** The connector's error behind a Sequelize error (err.original / err.parent), or the error itself. */
function driverError(err: unknown): DriverError | undefined {
  if (!err || typeof err !== 'object') return undefined;
  const e = err as DriverError;
  return e.original ?? e.parent ?? e;
}

/**
 * True for failures where the database rolled the transaction back (or never started it) and the
 * same work may simply run again: deadlocks, lock-wait timeouts, serialisation failures (SQLSTATE
 * 40001) and Galera's conflict reports. Never for timeouts or lost connections: a write may have
 * landed there, so running it again could do it twice.
 */
export function isRetriableTransactionError(err: unknown): boolean {
  const e = driverError(err);
  if (!e) return false;
  if (e.errno === DEADLOCK || e.errno === LOCK_WAIT_TIMEOUT || e.sqlState === '40001') return true;
  const wsrep = /\bWSREP\b/i.test(e.message ?? '');
  return wsrep && (e.errno === UNKNOWN_COM || e.errno === ERROR_DURING_COMMIT);
}

// The connector's own codes for a server that does not answer (lib/misc/errors.js in mariadb 3.0).
const CONNECTION_ALREADY_CLOSED = 45001;
const CMD_NOT_EXECUTED_DESTROYED = 45004;
const SOCKET_UNEXPECTED_CLOSE = 45009;
const CONNECTION_TIMEOUT = 45012;
const CMD_CONNECTION_CLOSED = 45013;
const SOCKET = 45019;
const SOCKET_TIMEOUT = 45026;
const POOL_ALREADY_CLOSED = 45027;
const GET_CONNECTION_TIMEOUT = 45028;
const STATEMENT_TIMEOUT = 1969; // ER_STATEMENT_TIMEOUT: max_statement_time (the pool's queryTimeout) ran out
const UNAVAILABLE = new Set([
  CONNECTION_ALREADY_CLOSED,
  CMD_NOT_EXECUTED_DESTROYED,
  SOCKET_UNEXPECTED_CLOSE,
  CONNECTION_TIMEOUT,
  CMD_CONNECTION_CLOSED,
  SOCKET,
  SOCKET_TIMEOUT,
  POOL_ALREADY_CLOSED,
  GET_CONNECTION_TIMEOUT,
  STATEMENT_TIMEOUT,
]);
const SOCKET_CODES = new Set(['ECONNRESET', 'ECONNREFUSED', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH']);

/**
 * True when the database did not answer in time or the connection broke: the request gets a 503
 * ("try again in a moment") rather than a 500. (Sequelize's ConnectionError family, e.g. a pool
 * acquire timeout or a refused connection, is recognised by its class in the error handler.)
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  const e = driverError(err);
  if (!e) return false;
  if (typeof e.errno === 'number' && UNAVAILABLE.has(e.errno)) return true;
  return typeof e.code === 'string' && SOCKET_CODES.has(e.code);
}
