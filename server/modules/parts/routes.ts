import { Router } from 'express';
import { z } from 'zod';
import { fileUploadOptionsSchema, partFileParamsSchema, partSubmissionSchema, partUpdateSchema, type PartUpdate } from '@shared/schemas/part';
import { boolish } from '@shared/validation';
import { AppError } from '../../errors';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { inspectUploads } from '../files/inspect';
import { EXTENSION, modelFileName } from '../files/sniff';
import { multipartFields, parseOrThrow, uploadedFiles, uploadMiddleware, withUploads } from '../files/upload';
import type { FileStorage } from '../files/storage';
import type { PartsService } from './service';

const STRUCTURED = ['bodies', 'mounts', 'keyDimensions', 'safety', 'recipes', 'make'];

const listQuerySchema = z.object({ mine: boolish.optional(), status: z.enum(['published']).optional() });
const idParamSchema = z.object({ id: z.string().min(1).max(100) });
const imageParamsSchema = partFileParamsSchema.extend({ size: z.enum(['thumb', 'display']) });

export function partsRoutes(parts: PartsService, storage: FileStorage) {
  const router = Router();
  const upload = uploadMiddleware(storage);

  router.get('/', validate('query', listQuerySchema), async (req, res) => {
    const query = res.locals.query as z.output<typeof listQuerySchema>;
    res.json({ items: await parts.list(currentUser(req), { mine: query.mine }) });
  });

  router.post(
    '/',
    requireAuth,
    ...upload,
    withUploads(async (req, res) => {
      const input = parseOrThrow(partSubmissionSchema, multipartFields(req, STRUCTURED));
      const files = await inspectUploads(uploadedFiles(req), { drawnInInches: input.drawnInInches });
      const created = await parts.create(currentUser(req)!, input, files);
      res.status(201).location(`/api/parts/${created.id}`).json(created);
    }),
  );

  router.get('/:id', validate('params', idParamSchema), async (req, res) => {
    res.json(await parts.get(currentUser(req), req.params.id as string));
  });

  router.patch('/:id', requireAuth, validate('params', idParamSchema), validate('body', partUpdateSchema), async (req, res) => {
    res.json(await parts.update(currentUser(req)!, req.params.id as string, res.locals.body as PartUpdate));
  });

  router.post('/:id/submit', requireAuth, validate('params', idParamSchema), async (req, res) => {
    res.json(await parts.resubmit(currentUser(req)!, req.params.id as string));
  });

  router.post(
    '/:id/files',
    requireAuth,
    validate('params', idParamSchema),
    ...upload,
    withUploads(async (req, res) => {
      const options = parseOrThrow(fileUploadOptionsSchema, req.body ?? {});
      const files = await inspectUploads(uploadedFiles(req), options);
      res.status(201).json(await parts.addFiles(currentUser(req)!, req.params.id as string, files));
    }),
  );

  router.delete('/:id/files/:fileId', requireAuth, validate('params', partFileParamsSchema), async (req, res) => {
    const { id, fileId } = res.locals.params as z.output<typeof partFileParamsSchema>;
    res.json(await parts.removeFile(currentUser(req)!, String(id), fileId));
  });

  router.get('/:id/files/:fileId/download', validate('params', partFileParamsSchema), async (req, res) => {
    if (!req.user) throw AppError.unauthorized('Sign in to download files from the shelf.');
    const { id, fileId } = res.locals.params as z.output<typeof partFileParamsSchema>;
    const { file, key } = await parts.storedFile(currentUser(req), String(id), fileId, 'original');
    res.setHeader('X-Content-Type-Options', 'nosniff');
    const name = file.kind === 'model' ? modelFileName(file.originalName, EXTENSION[file.format === '3mf' ? '3mf' : 'stl']) : file.originalName;
    res.attachment(file.kind === 'photo' ? file.originalName.replace(/\.[^.]+$/, '') + '.jpg' : name);
    res.type(file.mime);
    await storage.send(req, res, key);
  });

  router.get('/:id/files/:fileId/image/:size', validate('params', imageParamsSchema), async (req, res) => {
    const { id, fileId, size } = res.locals.params as z.output<typeof imageParamsSchema>;
    const { key } = await parts.storedFile(currentUser(req), String(id), fileId, size === 'thumb' ? 'thumbnail' : 'display');
    res.setHeader('Cache-Control', 'private, max-age=3600');
    res.type('image/jpeg');
    await storage.send(req, res, key);
  });

  return router;
}
