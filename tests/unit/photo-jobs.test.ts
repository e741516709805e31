import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { isPassingDatabaseFailure, MAX_PHOTO_ATTEMPTS, PhotoJobs } from '../../server/modules/files/photo-jobs';
import type { PhotoQueue } from '../../server/modules/files/photo-queue';
import type { PhotoResult } from '../../server/modules/files/photo-worker';
import { StorageUnavailableError, uploadDirs, type FileStorage } from '../../server/modules/files/storage';
import { createLocalStorage } from '../../server/modules/files/storage-local';

const root = mkdtempSync(join(tmpdir(), 'rigshelf-photo-jobs-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
const dirs = uploadDirs(root);
const storage = createLocalStorage(dirs);

/** A stand-in for the database row: what PhotoJobs reads and writes. */
function fakeRow(attempts = 0) {
  const row = {
    processing: 'pending' as 'ready' | 'pending' | 'failed',
    processingAttempts: attempts,
    async update(values: Partial<{ processing: 'ready' | 'failed'; processingAttempts: number }>) {
      Object.assign(row, values);
    },
  };
  return row;
}

/** A queue whose worker answers from a script, counting the jobs it was given. */
function scriptedQueue(results: PhotoResult[]) {
  const queue = {
    jobs: 0,
    async process(): Promise<PhotoResult> {
      return results[Math.min(queue.jobs++, results.length - 1)];
    },
    async close() {},
  };
  return queue;
}

function rawPhoto(name: string) {
  const path = join(dirs.incoming, name);
  writeFileSync(path, 'raw');
  return path;
}

async function run(queue: ReturnType<typeof scriptedQueue>, row: ReturnType<typeof fakeRow>, storedName: string) {
  const jobs = new PhotoJobs(storage, queue as unknown as PhotoQueue);
  jobs.clean({ storedName }, async () => row);
  await jobs.settled();
}

const timeout: PhotoResult = { ok: false, error: 'the task took longer than 60 s and was stopped', permanent: false };

describe('photo jobs · attempts', () => {
  it(`photo jobs · a worker timing out twice · failed for good after ${MAX_PHOTO_ATTEMPTS} attempts, the raw upload removed`, async () => {
    const queue = scriptedQueue([timeout, timeout, { ok: true, width: 1, height: 1 }]);
    const row = fakeRow();
    const raw = rawPhoto('twice-timed-out');
    await run(queue, row, 'twice-timed-out');
    expect(queue.jobs).toBe(2);
    expect(row).toMatchObject({ processing: 'failed', processingAttempts: 2 });
    expect(existsSync(raw)).toBe(false);
  });

  it('photo jobs · one timeout · tried again at once and may still succeed', async () => {
    const queue = scriptedQueue([timeout, { ok: true, width: 64, height: 48 }]);
    const row = fakeRow();
    rawPhoto('second-time-lucky');
    await run(queue, row, 'second-time-lucky');
    expect(row).toMatchObject({ processing: 'ready', processingAttempts: 2 });
  });

  it('photo jobs · a photo the decoder refuses · failed after one attempt (trying again would fail again)', async () => {
    const queue = scriptedQueue([{ ok: false, error: 'it cannot be decoded', permanent: true }]);
    const row = fakeRow();
    rawPhoto('undecodable');
    await run(queue, row, 'undecodable');
    expect(queue.jobs).toBe(1);
    expect(row).toMatchObject({ processing: 'failed', processingAttempts: 1 });
  });

  it('photo jobs · resumed at start-up after two attempts (it took the process down) · failed without running again', async () => {
    const queue = scriptedQueue([{ ok: true, width: 1, height: 1 }]);
    const row = fakeRow(2);
    const raw = rawPhoto('crashed-twice');
    await run(queue, row, 'crashed-twice');
    expect(queue.jobs).toBe(0);
    expect(row.processing).toBe('failed');
    expect(existsSync(raw)).toBe(false);
  });

  it('photo jobs · interrupted by shutdown · stays waiting; the try does not count', async () => {
    const queue = scriptedQueue([{ ok: false, error: 'the pool was closed', permanent: false, interrupted: true }]);
    const row = fakeRow(1);
    const raw = rawPhoto('interrupted');
    await run(queue, row, 'interrupted');
    expect(row).toMatchObject({ processing: 'pending', processingAttempts: 1 });
    expect(existsSync(raw)).toBe(true);
  });
});

/** What the mariadb connector reports when a query's socket times out (errno 45026, ER_SOCKET_TIMEOUT), wrapped as Sequelize wraps it. */
function socketTimeout() {
  return Object.assign(new Error('(conn:7, no: 45026, SQLState: 08S01) socket timeout'), {
    original: { errno: 45026, code: 'ER_SOCKET_TIMEOUT', sqlState: '08S01' },
  });
}

describe('photo jobs · the outcome write', () => {
  it('photo jobs · the database times out twice writing the outcome · written on a later try, the photo cleaned once', async () => {
    const queue = scriptedQueue([{ ok: true, width: 64, height: 48 }]);
    const row = fakeRow();
    const update = row.update;
    let refused = 0;
    row.update = async (values) => {
      if (values.processing === 'ready' && refused < 2) {
        refused += 1;
        throw socketTimeout();
      }
      return update(values);
    };
    const raw = rawPhoto('outcome-after-timeouts');
    await run(queue, row, 'outcome-after-timeouts');
    expect(refused).toBe(2);
    expect(queue.jobs).toBe(1);
    expect(row).toMatchObject({ processing: 'ready', processingAttempts: 1 });
    expect(existsSync(raw)).toBe(false);
  });

  it('photo jobs · the database stays away past the bound · the photo stays waiting with its raw upload for a later try', async () => {
    const queue = scriptedQueue([{ ok: true, width: 64, height: 48 }]);
    const row = fakeRow();
    const update = row.update;
    row.update = async (values) => {
      if (values.processing === 'ready') throw socketTimeout();
      return update(values);
    };
    const raw = rawPhoto('outcome-never-written');
    const jobs = new PhotoJobs(storage, queue as unknown as PhotoQueue, undefined, 300);
    const errors = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    jobs.clean({ storedName: 'outcome-never-written' }, async () => row);
    await jobs.settled();
    errors.mockRestore();
    expect(queue.jobs).toBe(1);
    expect(row).toMatchObject({ processing: 'pending', processingAttempts: 1 });
    expect(existsSync(raw)).toBe(true);
  });

  it('photo jobs · a plain error writing the outcome · not sent again (only passing database failures are)', () => {
    expect(isPassingDatabaseFailure(socketTimeout())).toBe(true);
    expect(isPassingDatabaseFailure({ original: { errno: 1213, message: 'Deadlock found when trying to get lock' } })).toBe(true);
    expect(isPassingDatabaseFailure(new Error('Data too long for column'))).toBe(false);
  });
});

/** The local store whose reads fail as an object store that does not answer would (the S3 driver's StorageUnavailableError) `away` times. */
function storeAwayFor(away: number) {
  let refused = 0;
  const flaky: FileStorage = Object.create(storage);
  flaky.localCopy = async (key: string) => {
    if (refused < away) {
      refused += 1;
      throw new StorageUnavailableError(`get ${key}: TimeoutError connect ETIMEDOUT`);
    }
    return storage.localCopy(key);
  };
  return { flaky, refused: () => refused };
}

describe('photo jobs · the object store away', () => {
  it('photo jobs · the store does not answer three times, then does · cleaned once; the tries it missed do not count', async () => {
    const queue = scriptedQueue([{ ok: true, width: 64, height: 48 }]);
    const row = fakeRow();
    const { flaky, refused } = storeAwayFor(3);
    const raw = rawPhoto('store-away-then-back');
    const errors = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const jobs = new PhotoJobs(flaky, queue as unknown as PhotoQueue, undefined, 30_000);
    jobs.clean({ storedName: 'store-away-then-back' }, async () => row);
    await jobs.settled();
    errors.mockRestore();
    expect(refused()).toBe(3);
    expect(queue.jobs).toBe(1);
    expect(row).toMatchObject({ processing: 'ready', processingAttempts: 1 });
    expect(existsSync(raw)).toBe(false);
  }, 30_000);

  it('photo jobs · the store stays away past the bound · left waiting with no try counted, never marked failed', async () => {
    const queue = scriptedQueue([{ ok: true, width: 64, height: 48 }]);
    const row = fakeRow();
    const { flaky } = storeAwayFor(Infinity);
    const raw = rawPhoto('store-away-for-long');
    const errors = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const jobs = new PhotoJobs(flaky, queue as unknown as PhotoQueue, undefined, 1_000);
    jobs.clean({ storedName: 'store-away-for-long' }, async () => row);
    await jobs.settled();
    expect(errors.mock.calls.some(([line]) => String(line).includes('left waiting, the object store is away'))).toBe(true);
    errors.mockRestore();
    expect(queue.jobs).toBe(0);
    expect(row).toMatchObject({ processing: 'pending', processingAttempts: 0 });
    expect(existsSync(raw)).toBe(true);
  });
});
