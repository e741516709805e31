// Where each kind of stored file lives (its storage keys), shared by parts, set reports and wanted
// requests, and how accepted uploads are placed before the write that files their rows.
import { commitOutcomeUnknown } from '../../db/transaction';
import type { InspectedFile } from './inspect';
import { randomStoredName, type FileStorage } from './storage';

export interface StoredKeys {
  /** Models and sources: the file itself. Photos: the raw upload until it is cleaned. */
  original: string;
  /** Photos: the cleaned sizes. Models: the shaded preview picture (render-model.ts). */
  display?: string;
  thumbnail?: string;
}

/** A stored file as its row knows it (a part's file, or a set report's or wanted request's photo: kind 'photo'). */
export interface StoredFileRow {
  kind: 'model' | 'photo' | 'source';
  storedName: string;
}

export function keysOf(file: StoredFileRow): StoredKeys {
  const sizes = { display: `store/${file.storedName}-display.jpg`, thumbnail: `store/${file.storedName}-thumb.jpg` };
  if (file.kind === 'model') return { original: `store/${file.storedName}`, ...sizes };
  if (file.kind !== 'photo') return { original: `store/${file.storedName}` };
  return { original: `incoming/${file.storedName}`, ...sizes };
}

/** The row's name a stored key belongs to (a model's or photo's sizes belong to it). */
export function storedNameOf(key: string): string {
  return key.replace(/^(incoming|store)\//, '').replace(/-(display|thumb)\.jpg$/, '');
}

export interface StagedUploads {
  /** The stored name of each upload, in the order given; the rows take these. */
  names: string[];
  /**
   * Awaits the write that files the rows. When it fails, the placed files are removed, unless its
   * commit went unanswered (the rows may have landed; the start-up sweep settles such files). When
   * `filedNothing` says the write filed no rows (a replayed Idempotency-Key), they are removed too.
   */
  settle<T>(write: Promise<T>, filedNothing?: (result: T) => boolean): Promise<T>;
}

/**
 * Places accepted uploads under new stored names before the write's transaction, so a slow object
 * store never holds a transaction, and the rows it locks, open while bytes travel. The temp copies
 * are removed with the request (withUploads).
 */
export async function stageUploads(storage: FileStorage, uploads: { path: string; kind: StoredFileRow['kind']; extension: string }[]): Promise<StagedUploads> {
  const names = uploads.map((u) => (u.kind === 'photo' ? randomStoredName('') : randomStoredName(u.extension)));
  const placed = await storage.placeUploads(uploads.map((u, i) => ({ from: u.path, key: keysOf({ kind: u.kind, storedName: names[i] }).original })));
  const discard = () => placed.undo().catch((err: unknown) => console.error('rigshelf: removing the files of a write that filed nothing:', err));
  return {
    names,
    async settle(write, filedNothing) {
      let result;
      try {
        result = await write;
      } catch (err) {
        if (!commitOutcomeUnknown(err)) await discard();
        throw err;
      }
      if (filedNothing?.(result)) await discard();
      return result;
    },
  };
}

/** The columns a set report's or wanted request's photo row takes from its staged upload (names from stageUploads, in order). */
export function photoColumns(files: InspectedFile[], names: string[]) {
  return files.map((f, i) => ({ storedName: names[i], originalName: f.originalName, sizeBytes: f.size, sha256: f.sha256, width: null, height: null }));
}
