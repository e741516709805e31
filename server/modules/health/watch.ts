// While the database does not answer, requests should hear so within about a second rather than each
// waiting out the pool's own timeouts. Once a request has failed that way (or the health check found
// the database silent), the next requests wait for one shared health probe instead: it either lets
// them through (the database is back) or they get a 503 at once.
import type { RequestHandler } from 'express';
import type { Sequelize } from 'sequelize';
import { AppError } from '../../errors';
import { databaseAnswers, HEALTH_TIMEOUT_MS } from './routes';

export interface DatabaseWatch {
  /** Probes the database now (one probe at a time, shared by everyone asking) and remembers the answer. */
  check(): Promise<boolean>;
  /** A request just failed because the database did not answer. */
  reportUnavailable(): void;
  /** For /api: answers 503 quickly while the database is known to be silent. */
  gate(): RequestHandler;
  readonly down: boolean;
}

export function createDatabaseWatch(sequelize: Sequelize, timeoutMs = HEALTH_TIMEOUT_MS): DatabaseWatch {
  let down = false;
  let probe: Promise<boolean> | null = null;

  function check(): Promise<boolean> {
    probe ??= databaseAnswers(sequelize, timeoutMs)
      .then((up) => {
        down = !up;
        return up;
      })
      .finally(() => {
        probe = null;
      });
    return probe;
  }

  return {
    check,
    reportUnavailable() {
      down = true;
    },
    gate() {
      return async (_req, _res, next) => {
        if (!down || (await check())) return next();
        next(new AppError(503, 'database_unavailable', 'The database is not reachable right now. Try again in a moment.'));
      };
    },
    get down() {
      return down;
    },
  };
}
