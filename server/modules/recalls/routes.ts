import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { recallParamsSchema } from '@shared/schemas/notices';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { RecallService } from './service';

/** Mounted on /api/kits beside the kit routes. */
export function kitRecallRoutes(recalls: RecallService) {
  const router = Router();

  router.get(
    '/:id/recalls',
    requireAuth,
    handler({ params: idParamSchema }, async ({ params }, req, res) => {
      res.json({ items: await recalls.forKit(currentUser(req)!, params.id) });
    }),
  );

  router.post(
    '/:id/recalls/:recallId/acknowledge',
    requireAuth,
    handler({ params: recallParamsSchema }, async ({ params }, req, res) => {
      await recalls.acknowledge(currentUser(req)!, params.id, params.recallId);
      res.status(204).end();
    }),
  );

  return router;
}
