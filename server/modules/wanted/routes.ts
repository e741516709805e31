import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { wantedAnswerSchema, wantedCloseSchema, wantedListSchema, wantedPhotoParamsSchema, wantedSchema } from '@shared/schemas/wanted';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { inspectUploads } from '../files/inspect';
import type { FileStorage } from '../files/storage';
import { multipartFields, uploadedFiles, uploadMiddleware, withUploads } from '../files/upload';
import type { WantedService } from './service';

/** /api/wanted: the crew's board of parts people are looking for. Members only. */
export function wantedRoutes(wanted: WantedService, storage: FileStorage) {
  const router = Router();
  router.use(requireAuth);
  const params = idParamSchema;

  router.get(
    '/',
    handler({ query: wantedListSchema }, async ({ query }, req, res) => {
      res.json({ items: await wanted.list(currentUser(req)!, query) });
    }),
  );

  // JSON, or multipart with the fields (or one `data` field) and up to three photos or sketches
  router.post(
    '/',
    ...uploadMiddleware(storage),
    withUploads(
      handler(
        { body: wantedSchema, fields: (req) => (req.is('multipart/form-data') ? multipartFields(req, ['mounts', 'keySizes']) : req.body) },
        async ({ body }, req, res) => {
          const files = await inspectUploads(uploadedFiles(req), { drawnInInches: false });
          const created = await wanted.create(currentUser(req)!, body, files);
          res
            .status(201)
            .location(`/api/wanted/${created.id}`)
            .json(await wanted.detail(currentUser(req)!, created.id));
        },
      ),
    ),
  );

  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await wanted.detail(currentUser(req)!, params.id));
    }),
  );

  router.post(
    '/:id/answers',
    handler({ params, body: wantedAnswerSchema }, async ({ params, body }, req, res) => {
      const result = await wanted.answer(currentUser(req)!, params.id, body);
      res.status(201).json(result);
    }),
  );

  router.post(
    '/:id/close',
    handler({ params, body: wantedCloseSchema }, async ({ params, body }, req, res) => {
      res.json(await wanted.close(currentUser(req)!, params.id, body));
    }),
  );

  router.get(
    '/:id/photos/:photoId/:size',
    handler({ params: wantedPhotoParamsSchema }, async ({ params: p }, req, res) => {
      const key = await wanted.photoKey(currentUser(req)!, p.id, p.photoId, p.size);
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.type('image/jpeg');
      await storage.send(req, res, key);
    }),
  );

  return router;
}
