import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { wantedAnswerSchema, wantedCloseSchema, wantedListSchema, wantedPhotoParamsSchema, wantedSchema } from '@shared/schemas/wanted';
import type { z } from 'zod';
import { currentUser, requireAuth } from '../../middleware/auth';
import { parsed, validate } from '../../middleware/validate';
import { inspectUploads } from '../files/inspect';
import type { FileStorage } from '../files/storage';
import { multipartFields, parseOrThrow, uploadedFiles, uploadMiddleware, withUploads } from '../files/upload';
import type { WantedService } from './service';

/** /api/wanted: the crew's board of parts people are looking for. Members only. */
export function wantedRoutes(wanted: WantedService, storage: FileStorage) {
  const router = Router();
  router.use(requireAuth);
  const params = validate('params', idParamSchema);
  const id = (res: { locals: Record<string, unknown> }) => (res.locals.params as { id: number }).id;

  router.get('/', validate('query', wantedListSchema), async (req, res) => {
    res.json({ items: await wanted.list(currentUser(req)!, parsed(res, 'query', wantedListSchema)) });
  });

  // JSON, or multipart with the fields (or one `data` field) and up to three photos or sketches
  router.post(
    '/',
    ...uploadMiddleware(storage),
    withUploads(async (req, res) => {
      const input = parseOrThrow(wantedSchema, req.is('multipart/form-data') ? multipartFields(req, ['mounts', 'keySizes']) : req.body);
      const files = await inspectUploads(uploadedFiles(req), { drawnInInches: false });
      const created = await wanted.create(currentUser(req)!, input, files);
      res.status(201).location(`/api/wanted/${created.id}`).json(await wanted.detail(currentUser(req)!, created.id));
    }),
  );

  router.get('/:id', params, async (req, res) => {
    res.json(await wanted.detail(currentUser(req)!, id(res)));
  });

  router.post('/:id/answers', params, validate('body', wantedAnswerSchema), async (req, res) => {
    const result = await wanted.answer(currentUser(req)!, id(res), parsed(res, 'body', wantedAnswerSchema));
    res.status(201).json(result);
  });

  router.post('/:id/close', params, validate('body', wantedCloseSchema), async (req, res) => {
    res.json(await wanted.close(currentUser(req)!, id(res), parsed(res, 'body', wantedCloseSchema)));
  });

  router.get('/:id/photos/:photoId/:size', validate('params', wantedPhotoParamsSchema), async (req, res) => {
    const p = res.locals.params as z.output<typeof wantedPhotoParamsSchema>;
    const key = await wanted.photoKey(currentUser(req)!, p.id, p.photoId, p.size);
    res.setHeader('Cache-Control', 'private, max-age=3600');
    res.type('image/jpeg');
    await storage.send(req, res, key);
  });

  return router;
}
