// Checks every uploaded file before anything is written to the database: size per kind, real type
// from the bytes, and for models the full mesh analysis.
import { MeshError, type ModelFileAnalysis } from '@shared/mesh';
import { analyseModelPath } from './analyse-model';
import { AppError } from '../../errors';
import { EXTENSION, MIME, sniffFile, type SniffedType } from './sniff';
import { UPLOAD_LIMITS } from '@shared/uploads';
import { sha256File, type FileField, type UploadedFile } from './upload';

export interface InspectedFile extends UploadedFile {
  type: SniffedType;
  mime: string;
  extension: string;
  sha256: string;
  analysis: ModelFileAnalysis | null;
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
    refuse(file, 413, 'file_too_large', `${file.field === 'photo' ? 'photos' : 'files'} may be at most ${mb(limit[file.field])}; this one is ${mb(file.size)}.`);
  }
}

async function inspectOne(file: UploadedFile, drawnInInches: boolean): Promise<InspectedFile> {
  checkSize(file);
  const sniffed = await sniffFile(file.path, file.size);
  let analysis: ModelFileAnalysis | null = null;
  let type = sniffed;

  if (file.field === 'model') {
    if (DESCRIBED[sniffed]) refuse(file, 422, 'not_a_model', `this is ${DESCRIBED[sniffed]}, not an STL or 3MF model.`);
    try {
      analysis = await analyseModelPath(file.path, { drawnInInches });
    } catch (err) {
      if (err instanceof MeshError) refuse(file, 422, 'bad_model', err.message);
      throw err;
    }
    type = analysis.format === '3mf' ? '3mf' : 'stl';
  } else if (file.field === 'photo') {
    if (!PHOTO_TYPES.includes(sniffed)) refuse(file, 422, 'not_a_photo', 'photos must be JPEG, PNG or WebP images.');
  } else if (!SOURCE_TYPES.includes(sniffed)) {
    refuse(file, 422, 'unsupported_source', 'source files may be STEP, IGES, plain text (e.g. a script), PDF drawings or a ZIP of CAD files.');
  }

  return { ...file, type, mime: MIME[type], extension: EXTENSION[type], sha256: await sha256File(file.path), analysis };
}

export async function inspectUploads(files: UploadedFile[], options: { drawnInInches: boolean }): Promise<InspectedFile[]> {
  const inspected: InspectedFile[] = [];
  // one at a time: model analysis holds the whole file in memory
  for (const file of files) inspected.push(await inspectOne(file, options.drawnInInches));
  return inspected;
}
