// Checks every uploaded file before anything is written to the database: size per kind, real type
// from the bytes, for models the full mesh analysis and for photos a complete decode. The heavy
// work runs in the upload-check worker pool, never on the event loop.
import { availableParallelism } from 'node:os';
import type { ModelFileAnalysis } from '@shared/mesh';
import { PHOTO_MAX_PIXELS, UPLOAD_LIMITS } from '@shared/uploads';
import { imageSizeFromFile } from 'image-size/fromFile';
import { AppError } from '../../errors';
import { EXTENSION, MIME, modelFileName, sniffFile, type SniffedType } from './sniff';
import { sha256File, type FileField, type UploadedFile } from './upload';
import { WorkerBusyError, WorkerCrashedError, WorkerPool, WorkerTimeoutError, type WorkerPoolOptions } from './worker-pool';

export interface InspectedFile extends UploadedFile {
  type: SniffedType;
  mime: string;
  extension: string;
  sha256: string;
  analysis: ModelFileAnalysis | null;
}

export const CHECK_POOL: WorkerPoolOptions = {
  name: 'upload checks',
  // the bound on analyses at once: leave a core to the event loop and the database
  maxThreads: Math.max(1, Math.min(4, availableParallelism() - 1)),
  maxQueue: 96,
  // a 3MF's model XML is decoded into one string on the heap (up to MODEL_LIMITS.maxUnpackedBytes)
  memoryMb: 1024,
  timeoutMs: 120_000,
  nice: 5,
};

// One pool for the process: the bound on concurrent analyses holds however many apps share it.
let checks: WorkerPool | null = null;
const checkPool = () => (checks ??= new WorkerPool(CHECK_POOL));

/** Stops the upload-check threads (the next upload starts them again). */
export async function closeCheckPool(): Promise<void> {
  const pool = checks;
  checks = null;
  await pool?.close();
}

const mb = (bytes: number) => `${Math.round(bytes / 1024 / 1024)} MB`;

const DESCRIBED: Partial<Record<SniffedType, string>> = {
  jpeg: 'a JPEG image',
  png: 'a PNG image',
  webp: 'a WebP image',
  pdf: 'a PDF document',
  zip: 'a ZIP archive without a 3D model in it',
  step: 'a STEP file (add it under source files)',
  iges: 'an IGES file (add it under source files)',
};

const SOURCE_TYPES: SniffedType[] = ['step', 'iges', 'text', 'zip', 'pdf', 'stl', '3mf'];
const PHOTO_TYPES: SniffedType[] = ['jpeg', 'png', 'webp'];

function refuse(file: UploadedFile, status: number, code: string, message: string): never {
  throw new AppError(status, code, `${file.originalName}: ${message}`, { [file.field]: `${file.originalName}: ${message}` });
}

function checkSize(file: UploadedFile) {
  const limit: Record<FileField, number> = UPLOAD_LIMITS;
  if (file.size === 0) refuse(file, 422, 'empty_file', 'the file is empty. Export it again.');
  if (file.size > limit[file.field]) {
    refuse(
      file,
      413,
      'file_too_large',
      `${file.field === 'photo' ? 'photos' : 'files'} may be at most ${mb(limit[file.field])}; this one is ${mb(file.size)}.`,
    );
  }
}

/** Runs a check in the pool; the pool's own failures become answers a contributor can act on. */
async function inPool<T>(file: UploadedFile, work: (pool: WorkerPool) => Promise<T>): Promise<T> {
  try {
    return await work(checkPool());
  } catch (err) {
    if (err instanceof WorkerBusyError) {
      throw new AppError(503, 'busy', 'Many uploads are being checked right now. Send yours again in a minute; nothing was saved.');
    }
    if (err instanceof WorkerTimeoutError)
      refuse(
        file,
        422,
        'too_complex',
        'checking this file took too long, so it was stopped. Simplify it (fewer facets or a smaller photo) and upload it again.',
      );
    if (err instanceof WorkerCrashedError)
      refuse(
        file,
        422,
        'too_complex',
        'checking this file needed more memory than we allow. Simplify it (fewer facets or a smaller photo) and upload it again.',
      );
    throw err;
  }
}

async function inspectModel(
  file: UploadedFile,
  sniffed: SniffedType,
  drawnInInches: boolean,
): Promise<{ type: SniffedType; analysis: ModelFileAnalysis; originalName: string }> {
  if (DESCRIBED[sniffed]) refuse(file, 422, 'not_a_model', `this is ${DESCRIBED[sniffed]}, not an STL or 3MF model.`);
  const result = await inPool(file, (pool) => pool.run('analyseModel', { path: file.path, drawnInInches }));
  if (!result.ok) refuse(file, 422, 'bad_model', result.message);
  const type = result.analysis.format === '3mf' ? '3mf' : 'stl';
  return { type, analysis: result.analysis, originalName: modelFileName(file.originalName, EXTENSION[type]) };
}

async function inspectPhoto(file: UploadedFile, sniffed: SniffedType): Promise<void> {
  if (!PHOTO_TYPES.includes(sniffed)) refuse(file, 422, 'not_a_photo', 'photos must be JPEG, PNG or WebP images.');
  // the header alone, before anything decodes the pixels
  const declared = await imageSizeFromFile(file.path).catch(() => null);
  if (!declared?.width || !declared.height) refuse(file, 422, 'bad_photo', 'the photo’s header is damaged, so it cannot be read. Export it again.');
  const pixels = declared.width * declared.height;
  if (pixels > PHOTO_MAX_PIXELS) {
    refuse(
      file,
      422,
      'photo_too_large',
      `the photo declares ${declared.width} × ${declared.height} pixels (${(pixels / 1e6).toFixed(1)} megapixels); photos may have at most ${PHOTO_MAX_PIXELS / 1e6} megapixels. Scale it down and upload it again.`,
    );
  }
  const check = await inPool(file, (pool) => pool.run('verifyPhoto', { path: file.path }));
  if (!check.ok) refuse(file, 422, 'bad_photo', `this photo cannot be used: ${check.reason}. Export or save it again.`);
}

async function inspectOne(file: UploadedFile, drawnInInches: boolean): Promise<InspectedFile> {
  checkSize(file);
  const sniffed = await sniffFile(file.path, file.size);
  let analysis: ModelFileAnalysis | null = null;
  let type = sniffed;
  let originalName = file.originalName;

  if (file.field === 'model') {
    ({ type, analysis, originalName } = await inspectModel(file, sniffed, drawnInInches));
  } else if (file.field === 'photo') {
    await inspectPhoto(file, sniffed);
  } else if (!SOURCE_TYPES.includes(sniffed)) {
    refuse(file, 422, 'unsupported_source', 'source files may be STEP, IGES, plain text (e.g. a script), PDF drawings or a ZIP of CAD files.');
  }

  return { ...file, originalName, type, mime: MIME[type], extension: EXTENSION[type], sha256: await sha256File(file.path), analysis };
}

/**
 * Checks all files of one upload side by side (the pool bounds how many run at once) and answers
 * with the first file's problem, in upload order, once every check has finished.
 */
export async function inspectUploads(files: UploadedFile[], options: { drawnInInches: boolean }): Promise<InspectedFile[]> {
  const results = await Promise.allSettled(files.map((file) => inspectOne(file, options.drawnInInches)));
  const failed = results.find((r): r is PromiseRejectedResult => r.status === 'rejected');
  if (failed) throw failed.reason;
  return results.map((r) => (r as PromiseFulfilledResult<InspectedFile>).value);
}
