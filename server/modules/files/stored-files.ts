// Where each kind of stored file lives (its storage keys), shared by parts, set reports and wanted
// requests, and how accepted uploads are placed inside a transaction.
import type { Transaction } from 'sequelize';
import { removeLocal, type FileStorage } from './storage';

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

/**
 * Places accepted uploads under their keys inside `t`. Returns the undo for the caller's rollback;
 * once `t` commits, the temp files are removed (with the local driver they were moved already).
 */
export async function placeFiles(storage: FileStorage, moves: { from: string; key: string }[], t: Transaction): Promise<() => Promise<void>> {
  const placed = await storage.placeUploads(moves);
  t.afterCommit(() => void removeLocal(...moves.map((m) => m.from)));
  return () => placed.undo();
}
