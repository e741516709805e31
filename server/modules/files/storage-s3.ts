// The S3-compatible driver (AWS SDK v3): a key is an object key in one bucket. Uploads are streamed
// from the local temp folder (lib-storage: one PUT for small files, multipart above the part size);
// downloads are streamed through the app after its permission checks, so the browser never needs
// the bucket's address and the page's content policy stays 'self'.
import { createReadStream, createWriteStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import {
  CopyObjectCommand,
  DeleteObjectCommand,
  DeleteObjectsCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
  type GetObjectCommandOutput,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import {
  assertKey,
  goneFromStorage,
  MissingObjectError,
  randomStoredName,
  singleRange,
  StorageUnavailableError,
  type FileStorage,
  type StoredObject,
} from './storage';

export interface S3Options {
  /** Unset: AWS S3 itself. */
  endpoint?: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  forcePathStyle: boolean;
  /** The local folder for uploads in progress and working copies. */
  tmp: string;
}

/** Parts of a multipart upload (S3's minimum is 5 MiB); files below it go up in one PUT. */
const PART_BYTES = 8 * 1024 * 1024;

const statusOf = (err: unknown) => (err as { $metadata?: { httpStatusCode?: number } })?.$metadata?.httpStatusCode;
const isMissing = (err: unknown) => {
  const name = (err as Error)?.name;
  return name === 'NoSuchKey' || name === 'NotFound' || statusOf(err) === 404;
};

/**
 * Refusals (4xx) are bugs or missing objects and stay as they are; no answer, a timeout or a 5xx is
 * the store being away, which the person sees as a 503.
 */
function translate(err: unknown, what: string): unknown {
  if (isMissing(err)) return err;
  const status = statusOf(err);
  if (err instanceof S3ServiceException && status && status < 500) return err;
  const detail = `${what}: ${(err as Error)?.name ?? 'Error'} ${(err as Error)?.message ?? String(err)}`;
  console.error(`rigshelf: object storage: ${detail}`);
  return new StorageUnavailableError(detail);
}

export function createS3Storage(options: S3Options): FileStorage & { client: S3Client; bucket: string } {
  const Bucket = options.bucket;
  const client = new S3Client({
    endpoint: options.endpoint,
    region: options.region,
    forcePathStyle: options.forcePathStyle,
    credentials: { accessKeyId: options.accessKeyId, secretAccessKey: options.secretAccessKey },
    // checksums only where S3 requires them: many S3-compatible stores refuse the newer
    // aws-chunked bodies with trailing CRC32 that the SDK sends by default
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 3,
    requestHandler: { connectionTimeout: 3_000, requestTimeout: 30_000 },
  });

  async function call<T>(what: string, run: () => Promise<T>): Promise<T> {
    try {
      return await run();
    } catch (err) {
      throw translate(err, what);
    }
  }

  async function getObject(key: string, extra: { Range?: string } = {}): Promise<GetObjectCommandOutput> {
    try {
      return await call(`get ${key}`, () => client.send(new GetObjectCommand({ Bucket, Key: assertKey(key), ...extra })));
    } catch (err) {
      throw isMissing(err) ? new MissingObjectError(key) : err;
    }
  }

  async function putFile(key: string, path: string, contentType?: string) {
    await call(`put ${key}`, async () => {
      const upload = new Upload({
        client,
        params: { Bucket, Key: assertKey(key), Body: createReadStream(path), ContentType: contentType },
        partSize: PART_BYTES,
        queueSize: 2,
        leavePartsOnError: false,
      });
      await upload.done();
    });
  }

  async function remove(keys: string[]) {
    for (let i = 0; i < keys.length; i += 1000) {
      const batch = keys.slice(i, i + 1000).map((k) => ({ Key: assertKey(k) }));
      if (batch.length === 1) {
        await call(`delete ${batch[0].Key}`, () => client.send(new DeleteObjectCommand({ Bucket, Key: batch[0].Key })));
        continue;
      }
      const out = await call('delete objects', () => client.send(new DeleteObjectsCommand({ Bucket, Delete: { Objects: batch, Quiet: true } })));
      const failed = (out.Errors ?? []).filter((e) => e.Code !== 'NoSuchKey');
      if (failed.length) throw new StorageUnavailableError(`delete refused for ${failed.map((e) => `${e.Key} (${e.Code})`).join(', ')}`);
    }
  }

  const tempPath = (suffix: string) => join(options.tmp, randomStoredName(suffix));

  const storage: FileStorage & { client: S3Client; bucket: string } = {
    driver: 's3',
    client,
    bucket: Bucket,
    tmp: options.tmp,

    putFile,

    async put(key, body, contentType) {
      await call(`put ${key}`, () => client.send(new PutObjectCommand({ Bucket, Key: assertKey(key), Body: body, ContentType: contentType })));
    },

    async get(key) {
      try {
        const out = await getObject(key);
        return Buffer.from(await out.Body!.transformToByteArray());
      } catch (err) {
        if (err instanceof MissingObjectError) return null;
        throw err;
      }
    },

    async stream(key, range) {
      const out = await getObject(key, range ? { Range: `bytes=${range.start}-${range.end ?? ''}` } : {});
      return out.Body as Readable;
    },

    async exists(key) {
      try {
        await call(`head ${key}`, () => client.send(new HeadObjectCommand({ Bucket, Key: assertKey(key) })));
        return true;
      } catch (err) {
        if (isMissing(err)) return false;
        throw err;
      }
    },

    remove,

    async list(prefix) {
      const out: StoredObject[] = [];
      let token: string | undefined;
      do {
        const page = await call(`list ${prefix}`, () => client.send(new ListObjectsV2Command({ Bucket, Prefix: prefix, ContinuationToken: token })));
        for (const o of page.Contents ?? []) if (o.Key) out.push({ key: o.Key, size: o.Size ?? 0, modified: o.LastModified ?? new Date(0) });
        token = page.IsTruncated ? page.NextContinuationToken : undefined;
      } while (token);
      return out;
    },

    async move(from, to) {
      try {
        await call(`copy ${from}`, () => client.send(new CopyObjectCommand({ Bucket, Key: assertKey(to), CopySource: `${Bucket}/${assertKey(from)}` })));
      } catch (err) {
        throw isMissing(err) ? new MissingObjectError(from) : err;
      }
      await remove([from]);
    },

    async localCopy(key) {
      const path = tempPath('.copy');
      try {
        const out = await getObject(key);
        await call(`download ${key}`, () => pipeline(out.Body as Readable, createWriteStream(path)));
      } catch (err) {
        await rm(path, { force: true });
        throw err;
      }
      return { path, release: () => rm(path, { force: true }) };
    },

    localOutput(key) {
      const path = tempPath('.out');
      return {
        path,
        async save() {
          await putFile(key, path, key.endsWith('.jpg') ? 'image/jpeg' : undefined);
          await rm(path, { force: true });
        },
        // after save() the temp file is gone already and the object stays
        discard: () => rm(path, { force: true }),
      };
    },

    // the temp files stay where they are, so a retried transaction can place them again; the
    // upload's own clean-up removes them when the request ends
    async placeUploads(moves) {
      const done: string[] = [];
      try {
        for (const m of moves) {
          await putFile(m.key, m.from);
          done.push(m.key);
        }
      } catch (err) {
        await remove(done.splice(0)).catch(() => undefined);
        throw err;
      }
      return {
        async undo() {
          await remove(done.splice(0));
        },
      };
    },

    async send(req, res, key) {
      const wanted = req.get('if-range') ? undefined : singleRange(req.get('range'));
      const since = req.get('if-modified-since');
      let out: GetObjectCommandOutput;
      try {
        out = await call(`get ${key}`, () =>
          client.send(
            new GetObjectCommand({
              Bucket,
              Key: assertKey(key),
              Range: wanted,
              IfNoneMatch: req.get('if-none-match'),
              IfModifiedSince: since && !req.get('if-none-match') ? new Date(since) : undefined,
            }),
          ),
        );
      } catch (err) {
        const status = statusOf(err);
        if (status === 304) {
          res.status(304).end();
          return;
        }
        if (status === 416) {
          const head = await call(`head ${key}`, () => client.send(new HeadObjectCommand({ Bucket, Key: key }))).catch(() => null);
          res.status(416);
          if (head?.ContentLength !== undefined) res.setHeader('Content-Range', `bytes */${head.ContentLength}`);
          res.end();
          return;
        }
        if (isMissing(err)) throw goneFromStorage();
        throw err;
      }
      const body = out.Body as Readable;
      res.status(out.ContentRange ? 206 : 200);
      res.setHeader('Accept-Ranges', 'bytes');
      if (out.ETag) res.setHeader('ETag', out.ETag);
      if (out.LastModified) res.setHeader('Last-Modified', out.LastModified.toUTCString());
      if (out.ContentLength !== undefined) res.setHeader('Content-Length', String(out.ContentLength));
      if (out.ContentRange) res.setHeader('Content-Range', out.ContentRange);
      if (req.method === 'HEAD') {
        body.destroy();
        res.end();
        return;
      }
      // a reader that goes away mid-file ends the download; that is not our error to answer
      await pipeline(body, res).catch((err: unknown) => {
        if (!res.destroyed && !res.writableFinished) throw translate(err, `stream ${key}`);
      });
    },

    close() {
      client.destroy();
    },
  };
  return storage;
}
