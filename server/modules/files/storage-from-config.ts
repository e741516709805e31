// Picks the storage driver from the validated config (STORAGE=local|s3).
import type { Config } from '../../config';
import { createLocalStorage } from './storage-local';
import { createS3Storage } from './storage-s3';
import { uploadDirs, type FileStorage, type UploadDirs } from './storage';

export function createStorage(
  config: Pick<
    Config,
    'UPLOADS_DIR' | 'STORAGE' | 'S3_ENDPOINT' | 'S3_BUCKET' | 'S3_REGION' | 'S3_ACCESS_KEY_ID' | 'S3_SECRET_ACCESS_KEY' | 'S3_FORCE_PATH_STYLE'
  >,
): {
  storage: FileStorage;
  /** The local folders; with s3 only `tmp` is used. */
  dirs: UploadDirs;
} {
  const dirs = uploadDirs(config.UPLOADS_DIR, { tmpOnly: config.STORAGE === 's3' });
  if (config.STORAGE === 'local') return { storage: createLocalStorage(dirs), dirs };
  const storage = createS3Storage({
    endpoint: config.S3_ENDPOINT,
    bucket: config.S3_BUCKET!,
    region: config.S3_REGION,
    accessKeyId: config.S3_ACCESS_KEY_ID!,
    secretAccessKey: config.S3_SECRET_ACCESS_KEY!,
    forcePathStyle: config.S3_FORCE_PATH_STYLE,
    tmp: dirs.tmp,
  });
  return { storage, dirs };
}
