import { Router } from 'express';
import { approveSchema, noteRequiredSchema, partIdParamSchema } from '@shared/schemas/review';
import { currentUser, requireRole } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { ReviewService } from './service';

export function reviewRoutes(review: ReviewService) {
  const router = Router();
  router.use(requireRole('moderator'));

  router.get('/queue', async (_req, res) => {
    res.json({ items: await review.queue() });
  });

  const params = partIdParamSchema;

  router.get(
    '/:partId',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await review.detail(currentUser(req)!, params.partId));
    }),
  );

  router.post(
    '/:partId/approve',
    handler({ params, body: approveSchema }, async ({ params, body }, req, res) => {
      res.json(await review.decide(currentUser(req)!, params.partId, 'approve', body));
    }),
  );

  for (const action of ['send-back', 'reject', 'retire'] as const) {
    router.post(
      `/:partId/${action}`,
      handler({ params, body: noteRequiredSchema }, async ({ params, body }, req, res) => {
        res.json(await review.decide(currentUser(req)!, params.partId, action, body));
      }),
    );
  }

  return router;
}
