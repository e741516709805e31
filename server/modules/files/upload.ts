// multer in front of every multipart route: files land in uploads/tmp under random names, limits
// are answered with 413/422 messages, and whatever the request did not claim is removed when it ends.
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import type { ErrorRequestHandler, Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import { UPLOAD_LIMITS } from '@shared/uploads';
import { AppError } from '../../errors';
import { displayName } from './sniff';
import { randomStoredName } from './storage';

export const FILE_FIELDS = ['model', 'photo', 'source'] as const;
export type FileField = (typeof FILE_FIELDS)[number];

export interface UploadedFile {
  field: FileField;
  path: string;
  originalName: string;
  size: number;
}

const mb = (bytes: number) => `${Math.round(bytes / 1024 / 1024)} MB`;

// Every file multer starts writing for a request, whether or not it ever reaches req.files, so
// cleanup never depends on the state of multer's entries (a dropped connection leaves half-made ones).
const started = new WeakMap<Request, Set<string>>();

/** `tmp`: the local folder uploads are received in (FileStorage.tmp). */
export function uploadMiddleware(dirs: { tmp: string }): RequestHandler[] {
  const upload = multer({
    storage: multer.diskStorage({
      destination: dirs.tmp,
      filename: (req, _file, cb) => {
        const name = randomStoredName('.upload');
        started.get(req)?.add(join(dirs.tmp, name));
        cb(null, name);
      },
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
    started.set(req, new Set());
    res.once('close', () => void removeUploads(req));
    next();
  };
  // errors while reading the body are the client's (cut off, malformed) unless the disk failed
  const receive: RequestHandler = (req, res, next) => {
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      void removeUploads(req).then(() => next(translateUploadError(err)));
    });
  };
  return [cleanup, receive];
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

/** Kept for errors raised by multer outside uploadMiddleware's wrapper. */
export const multerErrors: ErrorRequestHandler = (err, req, _res, next) => {
  if (!(err instanceof multer.MulterError)) return next(err);
  void removeUploads(req).then(() => next(translateMulterError(err)));
};

function translateUploadError(err: unknown): unknown {
  if (err instanceof multer.MulterError) return translateMulterError(err);
  if (err instanceof AppError) return err;
  // file-system failures (a full disk, permissions) are ours: let them reach the error handler as 500
  if (err instanceof Error && 'syscall' in err) return err;
  const detail = err instanceof Error ? err.message : String(err);
  return new AppError(
    400,
    'upload_incomplete',
    `The upload arrived incomplete or malformed (${detail}). Send it again; if it keeps failing, check the connection.`,
  );
}

function translateMulterError(err: multer.MulterError): AppError {
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError(413, 'file_too_large', `A file is larger than ${mb(UPLOAD_LIMITS.model)}. Reduce it (e.g. export with fewer facets) and try again.`);
    case 'LIMIT_FILE_COUNT':
      return new AppError(413, 'too_many_files', `Send at most ${UPLOAD_LIMITS.filesPerRequest} files in one upload; add the rest afterwards.`);
    case 'LIMIT_UNEXPECTED_FILE':
      return new AppError(422, 'unexpected_file', `Files go in the fields ${FILE_FIELDS.join(', ')}; "${err.field}" is not one of them.`);
    case 'LIMIT_FIELD_VALUE':
    case 'LIMIT_FIELD_COUNT':
    case 'LIMIT_FIELD_KEY':
    case 'LIMIT_PART_COUNT':
      return new AppError(413, 'form_too_large', 'The form is too large. Shorten the description or send fewer fields.');
    default:
      return new AppError(400, 'upload_incomplete', `The upload could not be read (${err.message}). Send it again.`);
  }
}

type MulterEntry = Partial<Express.Multer.File>;

function entries(req: Request): [FileField, MulterEntry][] {
  const files = (req.files ?? {}) as Record<string, MulterEntry[] | undefined>;
  return FILE_FIELDS.flatMap((field) => (files[field] ?? []).map((f): [FileField, MulterEntry] => [field, f]));
}

/** The files multer finished writing; entries it left half-made (no path yet) are skipped. */
export function uploadedFiles(req: Request): UploadedFile[] {
  return entries(req)
    .filter(([, f]) => typeof f.path === 'string' && typeof f.size === 'number')
    .map(([field, f]) => {
      // multer decodes names as latin1; browsers send UTF-8
      const name = typeof f.originalname === 'string' ? Buffer.from(f.originalname, 'latin1').toString('utf8') : '';
      if (name.includes('\0')) {
        throw new AppError(400, 'bad_file_name', 'A file name contains a NUL character, which no real file name has. Rename the file and send it again.', {
          [field]: 'The file name contains a NUL character.',
        });
      }
      return { field, path: f.path!, originalName: displayName(name), size: f.size! };
    });
}

/** Removes every file this request wrote that was not moved into place. Never rejects. */
async function removeUploads(req: Request): Promise<void> {
  try {
    const paths = new Set(started.get(req));
    for (const [, f] of entries(req)) if (typeof f.path === 'string') paths.add(f.path);
    await Promise.all([...paths].map((p) => rm(p, { force: true }).catch((err) => console.error(`could not remove upload ${p}:`, err))));
  } catch (err) {
    console.error('upload cleanup failed:', err);
  }
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
      throw AppError.field(key, `"${key}" must be JSON.`, 'Some fields need another look.');
    }
  }
  return out;
}
