import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { recallParamsSchema } from '@shared/schemas/notices';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import type { RecallService } from './service';

/** Mounted on /api/kits beside the kit routes. */
export function kitRecallRoutes(recalls: RecallService) {
  const router = Router();

  router.get('/:id/recalls', requireAuth, validate('params', idParamSchema), async (req, res) => {
    res.json({ items: await recalls.forKit(currentUser(req)!, (res.locals.params as { id: number }).id) });
  });

  router.post('/:id/recalls/:recallId/acknowledge', requireAuth, validate('params', recallParamsSchema), async (req, res) => {
    const { id, recallId } = res.locals.params as { id: number; recallId: number };
    await recalls.acknowledge(currentUser(req)!, id, recallId);
    res.status(204).end();
  });

  return router;
}
