import { Router } from 'express';
import type { Sequelize } from 'sequelize';
import type { HealthStatus } from '@shared/types';

/**
 * How long the health check waits for the database before it says "down" (the pool's own timeouts are
 * longer). Below the 1 s a load balancer or the chaos run allows, leaving room for a busy event loop.
 */
export const HEALTH_TIMEOUT_MS = 800;

/** True when the database answers `SELECT 1` within `timeoutMs`. */
export async function databaseAnswers(sequelize: Sequelize, timeoutMs = HEALTH_TIMEOUT_MS): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<boolean>((resolve) => {
    timer = setTimeout(() => resolve(false), timeoutMs);
  });
  const query = sequelize.query('SELECT 1').then(
    () => true,
    () => false,
  );
  try {
    return await Promise.race([query, late]);
  } finally {
    clearTimeout(timer);
  }
}

/** `check` defaults to a plain probe; the app passes its DatabaseWatch's, so the answer is remembered. */
export function healthRoutes(sequelize: Sequelize, options: { timeoutMs?: number; check?: () => Promise<boolean> } = {}) {
  const router = Router();
  const check = options.check ?? (() => databaseAnswers(sequelize, options.timeoutMs));
  router.get('/', async (_req, res) => {
    const up = await check();
    const body: HealthStatus = up ? { status: 'ok', db: 'up' } : { status: 'degraded', db: 'down' };
    res.status(up ? 200 : 503).json(body);
  });
  return router;
}
