// Set reports and ratings written with no signal wait in IndexedDB (idb) on this device, photos
// included, until they are sent. Each entry gets its key when it is written; the server files a key
// once (Idempotency-Key), so sending an entry again after a lost answer never files it twice.
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { RatingInput, SetReportInput } from '@shared/schemas/evidence';

/** Every entry belongs to the member who wrote it and is only ever sent with their session. */
export type QueuedEntry =
  | {
      key: string;
      userId: number;
      kind: 'report';
      partId: number;
      partSlug: string;
      partTitle: string;
      input: SetReportInput;
      photos: Blob[];
      photoNames: string[];
      writtenAt: string;
      problem: string | null;
    }
  | {
      key: string;
      userId: number;
      kind: 'rating';
      partId: number;
      partSlug: string;
      partTitle: string;
      input: RatingInput;
      writtenAt: string;
      problem: string | null;
    };

interface QueueDb extends DBSchema {
  entries: { key: string; value: QueuedEntry; indexes: { writtenAt: string } };
}

const DB_NAME = 'rigshelf-queue';
let db: Promise<IDBPDatabase<QueueDb>> | null = null;

function open() {
  db ??= openDB<QueueDb>(DB_NAME, 1, {
    upgrade(d) {
      d.createObjectStore('entries', { keyPath: 'key' }).createIndex('writtenAt', 'writtenAt');
    },
  });
  return db;
}

export async function put(entry: QueuedEntry): Promise<void> {
  await (await open()).put('entries', entry);
}

export async function all(): Promise<QueuedEntry[]> {
  return (await open()).getAllFromIndex('entries', 'writtenAt');
}

export async function remove(key: string): Promise<void> {
  await (await open()).delete('entries', key);
}

export async function clearAll(): Promise<void> {
  await (await open()).clear('entries');
}
