// A local S3 fake (s3rver) on a free port with a bucket of its own, for one test file.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startS3Fake, type S3Fake } from '../../server/scripts/s3-fake';

export async function startTestS3(bucket = 'rigshelf-test'): Promise<S3Fake> {
  const dir = mkdtempSync(join(tmpdir(), 'rigshelf-s3-'));
  const fake = await startS3Fake({ port: 0, dir, bucket });
  return {
    ...fake,
    async close() {
      await fake.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
