import { Router } from 'express';
import type { z } from 'zod';
import { approveSchema, noteRequiredSchema, partIdParamSchema } from '@shared/schemas/review';
import { currentUser, requireRole } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import type { ReviewService } from './service';

type PartIdParams = z.output<typeof partIdParamSchema>;

export function reviewRoutes(review: ReviewService) {
  const router = Router();
  router.use(requireRole('moderator'));

  router.get('/queue', async (_req, res) => {
    res.json({ items: await review.queue() });
  });

  router.get('/:partId', validate('params', partIdParamSchema), async (req, res) => {
    res.json(await review.detail(currentUser(req)!, (res.locals.params as PartIdParams).partId));
  });

  router.post('/:partId/approve', validate('params', partIdParamSchema), validate('body', approveSchema), async (req, res) => {
    const body = res.locals.body as z.output<typeof approveSchema>;
    res.json(await review.decide(currentUser(req)!, (res.locals.params as PartIdParams).partId, 'approve', body));
  });

  for (const action of ['send-back', 'reject', 'retire'] as const) {
    router.post(`/:partId/${action}`, validate('params', partIdParamSchema), validate('body', noteRequiredSchema), async (req, res) => {
      const body = res.locals.body as z.output<typeof noteRequiredSchema>;
      res.json(await review.decide(currentUser(req)!, (res.locals.params as PartIdParams).partId, action, body));
    });
  }

  return router;
}
