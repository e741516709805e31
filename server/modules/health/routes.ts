import { Router } from 'express';
import type { Sequelize } from 'sequelize';
import type { HealthStatus } from '@shared/types';

export function healthRoutes(sequelize: Sequelize) {
  const router = Router();
  router.get('/', async (_req, res) => {
    let up = true;
    try {
      await sequelize.query('SELECT 1');
    } catch {
      up = false;
    }
    const body: HealthStatus = up ? { status: 'ok', db: 'up' } : { status: 'degraded', db: 'down' };
    res.status(up ? 200 : 503).json(body);
  });
  return router;
}
