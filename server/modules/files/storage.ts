// Where uploaded content lives. Files arrive in tmp/ (multer), wait in incoming/ while photos are
// cleaned, and end in store/ under random names. Nothing in uploads/ is served directly.
import { randomBytes } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { readdir, rename, rm, stat } from 'node:fs/promises';
import { join, resolve } from 'node:path';

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

export async function removeQuietly(...paths: (string | undefined)[]): Promise<void> {
  await Promise.all(paths.filter(Boolean).map((p) => rm(p!, { force: true })));
}

/**
 * Moves files into place; if any move fails, the ones already moved go back, so the caller can
 * roll back its transaction and leave nothing half-done. undo() also puts them back where they came
 * from, so a transaction that is retried can move them again (and the upload's own clean-up removes
 * them if it is not).
 */
export async function moveAll(moves: { from: string; to: string }[]): Promise<{ undo(): Promise<void> }> {
  const done: { from: string; to: string }[] = [];
  try {
    for (const m of moves) {
      await rename(m.from, m.to);
      done.push(m);
    }
  } catch (err) {
    await Promise.all(done.map((m) => rename(m.to, m.from).catch(() => rm(m.to, { force: true }))));
    throw err;
  }
  return {
    async undo() {
      await Promise.all(done.splice(0).map((m) => rename(m.to, m.from).catch(() => rm(m.to, { force: true }))));
    },
  };
}

/** Names of the regular files in a folder that are older than `minAgeMs`. */
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
