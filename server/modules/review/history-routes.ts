import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import type { ReviewService } from './service';

/** GET /api/parts/:id/history — the audit trail of one part. */
export function partHistoryRoutes(review: ReviewService) {
  const router = Router();
  router.get('/:id/history', requireAuth, validate('params', idParamSchema), async (req, res) => {
    res.json({ items: await review.history(currentUser(req)!, (res.locals.params as { id: number }).id) });
  });
  return router;
}
