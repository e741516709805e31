import { Router, type Request } from 'express';
import { z } from 'zod';
import { flagSchema, ratingSchema, reportFilterSchema, setReportSchema, type RatingInput } from '@shared/schemas/evidence';
import { idParamSchema } from '@shared/schemas/auth';
import { noteRequiredSchema } from '@shared/schemas/review';
import { clientKeySchema } from '@shared/schemas/notices';
import { AppError } from '../../errors';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { inspectUploads } from '../files/inspect';
import type { FileStorage } from '../files/storage';
import { multipartFields, parseOrThrow, uploadedFiles, uploadMiddleware, withUploads } from '../files/upload';
import type { EvidenceService } from './service';

const partParam = z.object({ id: z.string().min(1).max(100) });
const photoParams = z.object({
  id: z.string().min(1).max(100),
  reportId: z.coerce.number().int().positive(),
  photoId: z.coerce.number().int().positive(),
  size: z.enum(['thumb', 'display']),
});

/** The Idempotency-Key a queued (offline) write carries, if any; a malformed one is a 422. */
function clientKeyOf(req: Request): string | undefined {
  const raw = req.get('idempotency-key');
  if (raw === undefined) return undefined;
  const parsed = clientKeySchema.safeParse(raw);
  if (!parsed.success) {
    const message = parsed.error.issues[0]?.message ?? 'The Idempotency-Key header is malformed.';
    throw new AppError(422, 'validation_failed', message, { idempotencyKey: message });
  }
  return parsed.data;
}

/** /api/parts/:id/ratings, /reports, /proven */
export function partEvidenceRoutes(evidence: EvidenceService, storage: FileStorage) {
  const router = Router();

  router.post('/:id/ratings', requireAuth, validate('params', partParam), validate('body', ratingSchema), async (req, res) => {
    const result = await evidence.rate(currentUser(req)!, req.params.id as string, res.locals.body as RatingInput, clientKeyOf(req));
    if (result.replayed) res.setHeader('Idempotent-Replayed', 'true');
    res.status(result.created ? 201 : 200).json(result.rating);
  });

  router.get('/:id/ratings', validate('params', partParam), async (req, res) => {
    res.json(await evidence.ratings(currentUser(req), req.params.id as string));
  });

  router.post(
    '/:id/reports',
    requireAuth,
    validate('params', partParam),
    ...uploadMiddleware(storage),
    withUploads(async (req, res) => {
      const clientKey = clientKeyOf(req);
      const input = parseOrThrow(setReportSchema, multipartFields(req, ['conditions']));
      const files = await inspectUploads(uploadedFiles(req), { drawnInInches: false });
      const filed = await evidence.fileReport(currentUser(req)!, req.params.id as string, input, files, clientKey);
      if (filed.replayed) res.setHeader('Idempotent-Replayed', 'true');
      res.status(filed.replayed ? 200 : 201).json({ id: filed.id });
    }),
  );

  router.get('/:id/reports', validate('params', partParam), validate('query', reportFilterSchema), async (req, res) => {
    res.json(await evidence.reports(currentUser(req), req.params.id as string, res.locals.query as z.output<typeof reportFilterSchema>));
  });

  router.get('/:id/reports/:reportId/photos/:photoId/:size', validate('params', photoParams), async (req, res) => {
    const p = res.locals.params as z.output<typeof photoParams>;
    const key = await evidence.reportPhotoKey(currentUser(req), p.id, p.reportId, p.photoId, p.size);
    res.setHeader('Cache-Control', 'private, max-age=3600');
    res.type('image/jpeg');
    await storage.send(req, res, key);
  });

  router.get('/:id/proven', validate('params', partParam), async (req, res) => {
    const e = await evidence.proven(currentUser(req), req.params.id as string);
    res.json(e);
  });

  return router;
}

/** /api/ratings/:id/flag and /api/reports/:id/flag */
export function flagRoutes(evidence: EvidenceService, type: 'rating' | 'report') {
  const router = Router();
  router.post('/:id/flag', requireAuth, validate('params', idParamSchema), validate('body', flagSchema), async (req, res) => {
    const { id } = res.locals.params as { id: number };
    res.status(201).json(await evidence.flag(currentUser(req)!, type, id, (res.locals.body as { reason: string }).reason));
  });
  return router;
}

/** Moderators: /api/review/flags, /api/review/ratings/:id/hide, /api/review/reports/:id/hide */
export function evidenceModerationRoutes(evidence: EvidenceService) {
  const router = Router();
  router.get('/flags', requireRole('moderator'), async (req, res) => {
    res.json({ items: await evidence.flagged(currentUser(req)!) });
  });
  for (const type of ['rating', 'report'] as const) {
    router.post(`/${type}s/:id/hide`, requireRole('moderator'), validate('params', idParamSchema), validate('body', noteRequiredSchema), async (req, res) => {
      const { id } = res.locals.params as { id: number };
      res.json(await evidence.hide(currentUser(req)!, type, id, (res.locals.body as { note: string }).note));
    });
  }
  return router;
}

/** /api/users/:id/profile */
export function profileRoutes(evidence: EvidenceService) {
  const router = Router();
  router.get('/:id/profile', validate('params', idParamSchema), async (req, res) => {
    res.json(await evidence.profile(currentUser(req), (res.locals.params as { id: number }).id));
  });
  return router;
}
