// multer in front of every multipart route: files land in uploads/tmp under random names, limits
// are answered with 413/422 messages, and whatever the request did not claim is removed when it ends.
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import type { ErrorRequestHandler, Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import { UPLOAD_LIMITS } from '@shared/uploads';
import type { z } from 'zod';
import { AppError } from '../../errors';
import { displayName } from './sniff';
import { randomStoredName } from './storage';
import type { UploadDirs } from './storage';


export const FILE_FIELDS = ['model', 'photo', 'source'] as const;
export type FileField = (typeof FILE_FIELDS)[number];

export interface UploadedFile {
  field: FileField;
  path: string;
  originalName: string;
  size: number;
}

const mb = (bytes: number) => `${Math.round(bytes / 1024 / 1024)} MB`;

export function uploadMiddleware(dirs: UploadDirs): RequestHandler[] {
  const upload = multer({
    storage: multer.diskStorage({
      destination: dirs.tmp,
      filename: (_req, _file, cb) => cb(null, randomStoredName('.upload')),
    }),
    limits: {
      fileSize: Math.max(UPLOAD_LIMITS.model, UPLOAD_LIMITS.source),
      files: UPLOAD_LIMITS.filesPerRequest,
      fields: 60,
      fieldSize: 1024 * 1024,
    },
  }).fields(FILE_FIELDS.map((name) => ({ name, maxCount: UPLOAD_LIMITS.filesPerRequest })));

  // a safety net for requests that end without reaching withUploads (e.g. the client went away)
  const cleanup: RequestHandler = (req, res, next) => {
    res.once('close', () => void removeUploads(req));
    next();
  };
  return [cleanup, upload];
}

/**
 * Wraps a handler of a multipart route: whatever uploads it did not move into place are removed
 * before the response goes out, success or failure.
 */
export function withUploads(handler: (req: Request, res: Response) => Promise<void>): RequestHandler {
  return async (req, res) => {
    try {
      await handler(req, res);
    } finally {
      await removeUploads(req);
    }
  };
}

export const multerErrors: ErrorRequestHandler = (err, req, _res, next) => {
  if (!(err instanceof multer.MulterError)) return next(err);
  removeUploads(req).finally(() => next(translateMulterError(err)));
};

function translateMulterError(err: multer.MulterError): AppError {
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError(413, 'file_too_large', `A file is larger than ${mb(UPLOAD_LIMITS.model)}. Reduce it (e.g. export with fewer facets) and try again.`);
    case 'LIMIT_FILE_COUNT':
      return new AppError(413, 'too_many_files', `Send at most ${UPLOAD_LIMITS.filesPerRequest} files in one upload; add the rest afterwards.`);
    case 'LIMIT_UNEXPECTED_FILE':
      return (new AppError(422, 'unexpected_file', `Files go in the fields ${FILE_FIELDS.join(', ')}; "${err.field}" is not one of them.`));
    case 'LIMIT_FIELD_VALUE':
    case 'LIMIT_FIELD_COUNT':
    case 'LIMIT_FIELD_KEY':
    case 'LIMIT_PART_COUNT':
      return new AppError(413, 'form_too_large', 'The form is too large. Shorten the description or send fewer fields.');
    default:
      return new AppError(422, 'upload_failed', `The upload could not be read (${err.message}). Try again.`);
  }
}

export function uploadedFiles(req: Request): UploadedFile[] {
  const files = (req.files ?? {}) as Record<string, Express.Multer.File[]>;
  return FILE_FIELDS.flatMap((field) =>
    (files[field] ?? []).map((f) => ({
      field,
      path: f.path,
      // multer decodes names as latin1; browsers send UTF-8
      originalName: displayName(Buffer.from(f.originalname, 'latin1').toString('utf8')),
      size: f.size,
    })),
  );
}

async function removeUploads(req: Request) {
  await Promise.all(uploadedFiles(req).map((f) => rm(f.path, { force: true })));
}

export function sha256File(path: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const hash = createHash('sha256');
    createReadStream(path)
      .on('data', (chunk) => hash.update(chunk))
      .on('end', () => resolve(hash.digest('hex')))
      .on('error', reject);
  });
}

/**
 * The fields of a multipart form: either one JSON field `data` with the whole object, or one field
 * per property, where the `structured` ones carry JSON text (a plain comma list is taken for arrays).
 */
export function multipartFields(req: Request, structured: readonly string[]): unknown {
  const body = (req.body ?? {}) as Record<string, unknown>;
  if (typeof body.data === 'string') {
    try {
      return JSON.parse(body.data);
    } catch {
      throw AppError.badRequest('The "data" field is not valid JSON.');
    }
  }
  const out: Record<string, unknown> = { ...body };
  for (const key of structured) {
    const value = out[key];
    if (typeof value !== 'string') continue;
    const text = value.trim();
    try {
      out[key] = /^[[{]/.test(text) ? JSON.parse(text) : text ? text.split(',').map((v) => v.trim()) : [];
    } catch {
      throw new AppError(422, 'validation_failed', 'Some fields need another look.', { [key]: `"${key}" must be JSON.` });
    }
  }
  return out;
}

/** Parses with a shared schema and answers 422 with per-field messages when that fails. */
export function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw AppError.validation(result.error);
  return result.data;
}
