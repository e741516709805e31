import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { ReviewService } from './service';

/** GET /api/parts/:id/history — the audit trail of one part. */
export function partHistoryRoutes(review: ReviewService) {
  const router = Router();
  router.get(
    '/:id/history',
    requireAuth,
    handler({ params: idParamSchema }, async ({ params }, req, res) => {
      res.json({ items: await review.history(currentUser(req)!, params.id) });
    }),
  );
  return router;
}
