// Where uploaded content lives, behind one interface with two drivers: the local disk
// (storage-local.ts, the default) and an S3-compatible bucket (storage-s3.ts). Either way, files
// arrive in a local temp folder (multer), and accepted ones are placed under a key: `incoming/<name>`
// for raw photos waiting to be cleaned, `store/<name>` for everything kept. Nothing is served
// directly: the routes check permissions, then `send` the object.
import { randomBytes } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { readdir, rm, stat } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import type { Readable } from 'node:stream';
import type { Request, Response } from 'express';
import { AppError } from '../../errors';

export interface UploadDirs {
  root: string;
  tmp: string;
  incoming: string;
  store: string;
}

export function uploadDirs(root: string): UploadDirs {
  const dirs = { root: resolve(root), tmp: resolve(root, 'tmp'), incoming: resolve(root, 'incoming'), store: resolve(root, 'store') };
  for (const dir of Object.values(dirs)) mkdirSync(dir, { recursive: true });
  return dirs;
}

export function randomStoredName(extension: string): string {
  return `${randomBytes(16).toString('hex')}${extension}`;
}

export interface StoredObject {
  key: string;
  size: number;
  modified: Date;
}

/** A stored object as a local file, for code that needs a path (worker threads); release() drops a downloaded copy. */
export interface LocalCopy {
  path: string;
  release(): Promise<void>;
}

/** A local file to write that becomes the object under `key` on save(); discard() drops what was written unless it was saved. */
export interface LocalOutput {
  path: string;
  save(): Promise<void>;
  discard(): Promise<void>;
}

export interface Placed {
  /** Takes the placed files out again (the local sources are still, or again, in the temp folder). */
  undo(): Promise<void>;
}

export class MissingObjectError extends Error {
  constructor(readonly key: string) {
    super(`${key} is not in storage`);
    this.name = 'MissingObjectError';
  }
}

/** A row whose file has gone from storage: the same 404 as a file that is not there. */
export const goneFromStorage = () => AppError.notFound('That file is no longer in storage.');

/** The object store did not answer (or answered 5xx): a clean 503 the person can act on. */
export class StorageUnavailableError extends AppError {
  constructor(detail: string) {
    super(503, 'storage_unavailable', 'File storage is not answering right now. Try again in a moment.');
    this.cause = detail;
  }
}

export interface FileStorage {
  readonly driver: 'local' | 's3';
  /** The local folder for uploads in progress and working copies (multer writes here). */
  readonly tmp: string;
  /** Streams a local file into `key`; the local file stays. */
  putFile(key: string, path: string, contentType?: string): Promise<void>;
  put(key: string, body: Buffer | string, contentType?: string): Promise<void>;
  /** The whole object, or null when there is none. */
  get(key: string): Promise<Buffer | null>;
  /** The object's bytes (`end` inclusive); MissingObjectError when there is none. */
  stream(key: string, range?: { start: number; end?: number }): Promise<Readable>;
  exists(key: string): Promise<boolean>;
  /** Removes the objects; one that is not there is no error. */
  remove(keys: string[]): Promise<void>;
  /** The objects whose key starts with `prefix` (`store/`, `incoming/`). */
  list(prefix: string): Promise<StoredObject[]>;
  move(from: string, to: string): Promise<void>;
  localCopy(key: string): Promise<LocalCopy>;
  localOutput(key: string): LocalOutput;
  /**
   * Moves accepted uploads from the temp folder under their keys. If one fails, those already placed
   * are taken out again and the error is thrown; undo() does the same later (a transaction rolled back).
   */
  placeUploads(moves: { from: string; key: string }[]): Promise<Placed>;
  /** Answers the request with the object (Range and conditional GET as express's sendFile); 404 when it is gone. */
  send(req: Request, res: Response, key: string): Promise<void>;
  close(): void;
}

const KEY = /^(incoming|store)\/[A-Za-z0-9][A-Za-z0-9._-]*$/;

/** Keys are made here from random names; anything else is a bug, never a path to follow. */
export function assertKey(key: string): string {
  if (!KEY.test(key) || key.includes('..')) throw new Error(`not a storage key: ${JSON.stringify(key)}`);
  return key;
}

/** Removes stored objects; failures are logged, never thrown (clean-up paths call it). */
export async function removeQuietly(storage: FileStorage, ...keys: (string | undefined)[]): Promise<void> {
  const list = keys.filter((k): k is string => !!k);
  if (!list.length) return;
  await storage.remove(list).catch((err: unknown) => console.error(`rigshelf: could not remove ${list.join(', ')} from storage:`, err));
}

/** Removes local files (temp copies, uploads in progress); never rejects. */
export async function removeLocal(...paths: (string | undefined)[]): Promise<void> {
  await Promise.all(paths.filter(Boolean).map((p) => rm(p!, { force: true }).catch(() => undefined)));
}

/** Names of the regular files in a local folder that are older than `minAgeMs`. */
export async function filesOlderThan(dir: string, minAgeMs: number): Promise<string[]> {
  const names = await readdir(dir).catch(() => [] as string[]);
  const now = Date.now();
  const old: string[] = [];
  for (const name of names) {
    const s = await stat(join(dir, name)).catch(() => null);
    if (s?.isFile() && now - s.mtimeMs >= minAgeMs) old.push(name);
  }
  return old;
}

/** A single `bytes=a-b` range of a Range header; several ranges or other units are answered whole. */
export function singleRange(header: string | undefined): string | undefined {
  if (!header) return undefined;
  const m = /^bytes=(\d*)-(\d*)$/.exec(header.trim());
  if (!m || (!m[1] && !m[2])) return undefined;
  return `bytes=${m[1]}-${m[2]}`;
}
