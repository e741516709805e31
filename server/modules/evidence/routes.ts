import { Router } from 'express';
import { z } from 'zod';
import { flagSchema, ratingSchema, reportFilterSchema, setReportSchema } from '@shared/schemas/evidence';
import { idParamSchema } from '@shared/schemas/auth';
import { noteRequiredSchema } from '@shared/schemas/review';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { inspectUploads } from '../files/inspect';
import type { FileStorage } from '../files/storage';
import { multipartFields, uploadedFiles, uploadMiddleware, withUploads } from '../files/upload';
import { clientKeyOf } from './client-keys';
import type { EvidenceService } from './service';

const partParam = z.object({ id: z.string().min(1).max(100) });
const photoParams = z.object({
  id: z.string().min(1).max(100),
  reportId: z.coerce.number().int().positive(),
  photoId: z.coerce.number().int().positive(),
  size: z.enum(['thumb', 'display']),
});

/** /api/parts/:id/ratings, /reports, /proven */
export function partEvidenceRoutes(evidence: EvidenceService, storage: FileStorage) {
  const router = Router();
  const params = partParam;

  router.post(
    '/:id/ratings',
    requireAuth,
    handler({ params, body: ratingSchema }, async ({ params, body }, req, res) => {
      const result = await evidence.rate(currentUser(req)!, params.id, body, clientKeyOf(req));
      if (result.replayed) res.setHeader('Idempotent-Replayed', 'true');
      res.status(result.created ? 201 : 200).json(result.rating);
    }),
  );

  router.get(
    '/:id/ratings',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await evidence.ratings(currentUser(req), params.id));
    }),
  );

  router.post(
    '/:id/reports',
    requireAuth,
    ...uploadMiddleware(storage),
    withUploads(async (req, res) => {
      const clientKey = clientKeyOf(req);
      await handler({ params, body: setReportSchema, fields: (r) => multipartFields(r, ['conditions']) }, async ({ params, body }) => {
        const files = await inspectUploads(uploadedFiles(req), { drawnInInches: false });
        const filed = await evidence.fileReport(currentUser(req)!, params.id, body, files, clientKey);
        if (filed.replayed) res.setHeader('Idempotent-Replayed', 'true');
        res.status(filed.replayed ? 200 : 201).json({ id: filed.id });
      })(req, res);
    }),
  );

  router.get(
    '/:id/reports',
    handler({ params, query: reportFilterSchema }, async ({ params, query }, req, res) => {
      res.json(await evidence.reports(currentUser(req), params.id, query));
    }),
  );

  router.get(
    '/:id/reports/:reportId/photos/:photoId/:size',
    handler({ params: photoParams }, async ({ params: p }, req, res) => {
      const key = await evidence.reportPhotoKey(currentUser(req), p.id, p.reportId, p.photoId, p.size);
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.type('image/jpeg');
      await storage.send(req, res, key);
    }),
  );

  router.get(
    '/:id/proven',
    handler({ params }, async ({ params }, req, res) => {
      const e = await evidence.proven(currentUser(req), params.id);
      res.json(e);
    }),
  );

  return router;
}

/** /api/ratings/:id/flag and /api/reports/:id/flag */
export function flagRoutes(evidence: EvidenceService, type: 'rating' | 'report') {
  const router = Router();
  router.post(
    '/:id/flag',
    requireAuth,
    handler({ params: idParamSchema, body: flagSchema }, async ({ params, body }, req, res) => {
      res.status(201).json(await evidence.flag(currentUser(req)!, type, params.id, body.reason));
    }),
  );
  return router;
}

/** Moderators: /api/review/flags, /api/review/ratings/:id/hide, /api/review/reports/:id/hide */
export function evidenceModerationRoutes(evidence: EvidenceService) {
  const router = Router();
  router.get('/flags', requireRole('moderator'), async (req, res) => {
    res.json({ items: await evidence.flagged(currentUser(req)!) });
  });
  for (const type of ['rating', 'report'] as const) {
    router.post(
      `/${type}s/:id/hide`,
      requireRole('moderator'),
      handler({ params: idParamSchema, body: noteRequiredSchema }, async ({ params, body }, req, res) => {
        res.json(await evidence.hide(currentUser(req)!, type, params.id, body.note));
      }),
    );
  }
  return router;
}

/** /api/users/:id/profile */
export function profileRoutes(evidence: EvidenceService) {
  const router = Router();
  router.get(
    '/:id/profile',
    handler({ params: idParamSchema }, async ({ params }, req, res) => {
      res.json(await evidence.profile(currentUser(req), params.id));
    }),
  );
  return router;
}
