// Submission drafts kept in the browser's IndexedDB (through `idb`) until they are sent or
// discarded: every field and the chosen files themselves (a File is stored as it is). One draft per
// member and flow ("new", "adapt:12", "edit:12"), so switching flows never overwrites another draft.
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { PartDraftSnapshot } from '@/stores/partDraft';

export interface StoredDraft {
  /** `${userId}:${flow}` */
  id: string;
  userId: number;
  flow: string;
  savedAt: string;
  snapshot: PartDraftSnapshot;
}

interface DraftDb extends DBSchema {
  drafts: { key: string; value: StoredDraft; indexes: { byUser: number } };
}

let opening: Promise<IDBPDatabase<DraftDb>> | null = null;

function db(): Promise<IDBPDatabase<DraftDb>> {
  opening ??= openDB<DraftDb>('rigshelf-drafts', 1, {
    upgrade(database) {
      const store = database.createObjectStore('drafts', { keyPath: 'id' });
      store.createIndex('byUser', 'userId');
    },
  });
  return opening;
}

/** False where IndexedDB is missing (some private modes): the form then works without keeping drafts. */
export const draftsAvailable = typeof indexedDB !== 'undefined';

export async function loadDraft(userId: number, flow: string): Promise<StoredDraft | null> {
  if (!draftsAvailable) return null;
  return (await (await db()).get('drafts', `${userId}:${flow}`)) ?? null;
}

export async function saveDraft(userId: number, flow: string, snapshot: PartDraftSnapshot): Promise<void> {
  if (!draftsAvailable) return;
  await (await db()).put('drafts', { id: `${userId}:${flow}`, userId, flow, savedAt: new Date().toISOString(), snapshot });
}

export async function discardDraft(userId: number, flow: string): Promise<void> {
  if (!draftsAvailable) return;
  await (await db()).delete('drafts', `${userId}:${flow}`);
}
