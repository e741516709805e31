import { Router } from 'express';
import { z } from 'zod';
import { fileUploadOptionsSchema, partFileParamsSchema, partSubmissionSchema, partUpdateSchema } from '@shared/schemas/part';
import { boolish } from '@shared/validation';
import { AppError } from '../../errors';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { clientKeyOf } from '../evidence/client-keys';
import { inspectUploads } from '../files/inspect';
import { EXTENSION, modelFileName } from '../files/sniff';
import { multipartFields, uploadedFiles, uploadMiddleware, withUploads } from '../files/upload';
import type { FileStorage } from '../files/storage';
import type { PartsService } from './service';

const STRUCTURED = ['bodies', 'mounts', 'keyDimensions', 'safety', 'recipes', 'make'];

const listQuerySchema = z.object({ mine: boolish.optional(), status: z.enum(['published']).optional() });
const idParamSchema = z.object({ id: z.string().min(1).max(100) });
const imageParamsSchema = partFileParamsSchema.extend({ size: z.enum(['thumb', 'display']) });

export function partsRoutes(parts: PartsService, storage: FileStorage) {
  const router = Router();
  const upload = uploadMiddleware(storage);
  const params = idParamSchema;

  router.get(
    '/',
    handler({ query: listQuerySchema }, async ({ query }, req, res) => {
      res.json({ items: await parts.list(currentUser(req), { mine: query.mine }) });
    }),
  );

  router.post(
    '/',
    requireAuth,
    ...upload,
    withUploads(
      handler({ body: partSubmissionSchema, fields: (req) => multipartFields(req, STRUCTURED) }, async ({ body: input }, req, res) => {
        const files = await inspectUploads(uploadedFiles(req), { drawnInInches: input.drawnInInches });
        const created = await parts.create(currentUser(req)!, input, files, clientKeyOf(req));
        res.status(201).location(`/api/parts/${created.id}`).json(created);
      }),
    ),
  );

  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await parts.get(currentUser(req), params.id));
    }),
  );

  router.patch(
    '/:id',
    requireAuth,
    handler({ params, body: partUpdateSchema }, async ({ params, body }, req, res) => {
      res.json(await parts.update(currentUser(req)!, params.id, body));
    }),
  );

  router.post(
    '/:id/submit',
    requireAuth,
    handler({ params }, async ({ params }, req, res) => {
      res.json(await parts.resubmit(currentUser(req)!, params.id));
    }),
  );

  router.post(
    '/:id/files',
    requireAuth,
    ...upload,
    withUploads(
      handler({ params, body: fileUploadOptionsSchema }, async ({ params, body: options }, req, res) => {
        const files = await inspectUploads(uploadedFiles(req), options);
        res.status(201).json(await parts.addFiles(currentUser(req)!, params.id, files));
      }),
    ),
  );

  router.delete(
    '/:id/files/:fileId',
    requireAuth,
    handler({ params: partFileParamsSchema }, async ({ params }, req, res) => {
      res.json(await parts.removeFile(currentUser(req)!, String(params.id), params.fileId));
    }),
  );

  router.get(
    '/:id/files/:fileId/download',
    handler({ params: partFileParamsSchema }, async ({ params }, req, res) => {
      if (!req.user) throw AppError.unauthorized('Sign in to download files from the shelf.');
      const { file, key } = await parts.storedFile(currentUser(req), String(params.id), params.fileId, 'original');
      res.setHeader('X-Content-Type-Options', 'nosniff');
      const name = file.kind === 'model' ? modelFileName(file.originalName, EXTENSION[file.format === '3mf' ? '3mf' : 'stl']) : file.originalName;
      res.attachment(file.kind === 'photo' ? file.originalName.replace(/\.[^.]+$/, '') + '.jpg' : name);
      res.type(file.mime);
      await storage.send(req, res, key);
    }),
  );

  router.get(
    '/:id/files/:fileId/image/:size',
    handler({ params: imageParamsSchema }, async ({ params }, req, res) => {
      const { id, fileId, size } = params;
      const { key } = await parts.storedFile(currentUser(req), String(id), fileId, size === 'thumb' ? 'thumbnail' : 'display');
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.type('image/jpeg');
      await storage.send(req, res, key);
    }),
  );

  return router;
}
