// The local-disk driver: a key is a path under UPLOADS_DIR (store/<name>, incoming/<name>).
// Placing an upload is a rename within one file system, so it is instant and all-or-nothing.
import { createReadStream } from 'node:fs';
import { copyFile, readdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { assertKey, goneFromStorage, MissingObjectError, uploadDirs, type FileStorage, type StoredObject, type UploadDirs } from './storage';

const isMissing = (err: unknown) => (err as NodeJS.ErrnoException)?.code === 'ENOENT';

export function createLocalStorage(dirsOrRoot: UploadDirs | string): FileStorage & { dirs: UploadDirs } {
  const dirs = typeof dirsOrRoot === 'string' ? uploadDirs(dirsOrRoot) : dirsOrRoot;
  const pathOf = (key: string) => join(dirs.root, assertKey(key));

  const storage: FileStorage & { dirs: UploadDirs } = {
    driver: 'local',
    dirs,
    tmp: dirs.tmp,

    async putFile(key, path) {
      const to = pathOf(key);
      await copyFile(path, `${to}.part`);
      await rename(`${to}.part`, to);
    },

    async put(key, body) {
      const to = pathOf(key);
      await writeFile(`${to}.part`, body);
      await rename(`${to}.part`, to);
    },

    async get(key) {
      return readFile(pathOf(key)).catch((err) => {
        if (isMissing(err)) return null;
        throw err;
      });
    },

    async stream(key, range) {
      const path = pathOf(key);
      const s = await stat(path).catch((err) => {
        throw isMissing(err) ? new MissingObjectError(key) : err;
      });
      if (!s.isFile()) throw new MissingObjectError(key);
      return createReadStream(path, range ? { start: range.start, end: range.end } : {}) as Readable;
    },

    async exists(key) {
      return (await stat(pathOf(key)).catch(() => null))?.isFile() ?? false;
    },

    async remove(keys) {
      await Promise.all(keys.map((k) => rm(pathOf(k), { force: true })));
    },

    async list(prefix) {
      const slash = prefix.indexOf('/');
      const area = prefix.slice(0, slash);
      const start = prefix.slice(slash + 1);
      if (slash < 0 || !['incoming', 'store'].includes(area)) throw new Error(`not a storage prefix: ${prefix}`);
      const names = await readdir(join(dirs.root, area)).catch(() => [] as string[]);
      const out: StoredObject[] = [];
      for (const name of names.filter((n) => n.startsWith(start)).sort()) {
        const s = await stat(join(dirs.root, area, name)).catch(() => null);
        if (s?.isFile()) out.push({ key: `${area}/${name}`, size: s.size, modified: s.mtime });
      }
      return out;
    },

    async move(from, to) {
      await rename(pathOf(from), pathOf(to)).catch((err) => {
        throw isMissing(err) ? new MissingObjectError(from) : err;
      });
    },

    async localCopy(key) {
      const path = pathOf(key);
      if (!(await storage.exists(key))) throw new MissingObjectError(key);
      return { path, release: async () => undefined };
    },

    // workers write straight to the final place, as they always have
    localOutput(key) {
      const path = pathOf(key);
      let saved = false;
      return {
        path,
        save: async () => void (saved = true),
        discard: async () => (saved ? undefined : rm(path, { force: true })),
      };
    },

    async placeUploads(moves) {
      const done: { from: string; to: string }[] = [];
      const back = () => Promise.all(done.splice(0).map((m) => rename(m.to, m.from).catch(() => rm(m.to, { force: true }))));
      try {
        for (const m of moves) {
          const to = pathOf(m.key);
          await rename(m.from, to);
          done.push({ from: m.from, to });
        }
      } catch (err) {
        await back();
        throw err;
      }
      return {
        async undo() {
          await back();
        },
      };
    },

    async send(req, res, key) {
      const path = pathOf(key);
      await new Promise<void>((resolve, reject) => {
        res.sendFile(path, (err?: Error) => {
          if (!err || res.headersSent) return resolve();
          reject(isMissing(err) ? goneFromStorage() : err);
        });
      });
    },

    close() {},
  };
  return storage;
}
