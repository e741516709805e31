import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DatabaseError, type Sequelize } from 'sequelize';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { transact, type RetryPolicy } from '../../server/db/transaction';
import { createLocalStorage } from '../../server/modules/files/storage-local';
import { stageUploads } from '../../server/modules/files/stored-files';

// errno and SQLSTATE from the MariaDB error code reference (mariadb.com/kb "MariaDB Error Codes")
function dbError(errno: number, sqlState: string, message: string, code: string) {
  return new DatabaseError(Object.assign(new Error(message), { errno, sqlState, code, sql: 'INSERT …' }) as Error & { sql: string });
}
const deadlock = () => dbError(1213, '40001', 'Deadlock found when trying to get lock; try restarting transaction', 'ER_LOCK_DEADLOCK');

/** Sequelize's transaction() as far as transact() uses it; `commit` decides how each commit ends. */
function fakeSequelize(commit: () => Promise<void> = async () => undefined) {
  return { transaction: async () => ({ commit, rollback: async () => undefined }) } as unknown as Sequelize;
}
const quick: RetryPolicy = { attempts: 3, baseDelayMs: 1, maxDelayMs: 2 };

let root: string;
let storage: ReturnType<typeof createLocalStorage>;
beforeEach(() => {
  root = mkdtempSync(join(tmpdir(), 'rigshelf-staged-'));
  storage = createLocalStorage(root);
});
afterEach(() => rmSync(root, { recursive: true, force: true }));

function upload(name: string) {
  const path = join(storage.dirs.tmp, name);
  writeFileSync(path, `bytes of ${name}`);
  return path;
}
const stored = () => [...readdirSync(storage.dirs.store), ...readdirSync(storage.dirs.incoming).map((n) => `incoming/${n}`)].sort();

describe('stageUploads · files placed before the write that files their rows', () => {
  it('stageUploads · a model and a photo, the write commits · both in place under the names the rows got', async () => {
    const staged = await stageUploads(storage, [
      { path: upload('a.upload'), kind: 'model', extension: '.stl' },
      { path: upload('b.upload'), kind: 'photo', extension: '' },
    ]);
    const names = await staged.settle(transact(fakeSequelize(), async () => staged.names, quick));
    expect(names[0]).toMatch(/^[0-9a-f]{32}\.stl$/);
    expect(names[1]).toMatch(/^[0-9a-f]{32}$/);
    // models go straight to store/, photos wait in incoming/ to be cleaned (keysOf)
    expect(stored()).toEqual([names[0], `incoming/${names[1]}`].sort());
  });

  it('stageUploads · a deadlock, then a commit · the files are placed once and stay for the attempt that committed', async () => {
    const placeUploads = vi.spyOn(storage, 'placeUploads');
    const staged = await stageUploads(storage, [{ path: upload('a.upload'), kind: 'model', extension: '.stl' }]);
    let attempts = 0;
    await staged.settle(
      transact(
        fakeSequelize(),
        async () => {
          attempts += 1;
          if (attempts === 1) throw deadlock();
        },
        quick,
      ),
    );
    expect(attempts).toBe(2);
    expect(placeUploads).toHaveBeenCalledTimes(1);
    expect(stored()).toEqual(staged.names);
  });

  it('stageUploads · the write fails for good · nothing is left in storage', async () => {
    const staged = await stageUploads(storage, [
      { path: upload('a.upload'), kind: 'model', extension: '.stl' },
      { path: upload('b.upload'), kind: 'photo', extension: '' },
    ]);
    await expect(
      staged.settle(
        transact(
          fakeSequelize(),
          async () => {
            throw new Error('the licence does not allow it');
          },
          quick,
        ),
      ),
    ).rejects.toThrow('licence');
    expect(stored()).toEqual([]);
  });

  it('stageUploads · a replayed Idempotency-Key files nothing · its files are removed, the first answer stands', async () => {
    const staged = await stageUploads(storage, [{ path: upload('a.upload'), kind: 'photo', extension: '' }]);
    const out = await staged.settle(
      transact(fakeSequelize(), async () => ({ id: 7, replayed: true }), quick),
      (r) => r.replayed,
    );
    expect(out).toEqual({ id: 7, replayed: true });
    expect(stored()).toEqual([]);
  });

  it('stageUploads · the commit goes unanswered (connection lost) · the files stay, as the rows may have landed', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const staged = await stageUploads(storage, [{ path: upload('a.upload'), kind: 'model', extension: '.3mf' }]);
    // the connector's ER_SOCKET_UNEXPECTED_CLOSE (45009, mariadb-connector-nodejs lib/misc/errors.js)
    const lost = fakeSequelize(async () => {
      throw dbError(45009, '08S01', 'socket has unexpectedly been closed', 'ER_SOCKET_UNEXPECTED_CLOSE');
    });
    await expect(staged.settle(transact(lost, async () => undefined, quick))).rejects.toThrow('unexpectedly been closed');
    expect(stored()).toEqual(staged.names);
    expect(existsSync(join(storage.dirs.store, staged.names[0]))).toBe(true);
  });
});
