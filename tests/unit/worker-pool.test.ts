import { afterAll, describe, expect, it } from 'vitest';
import { WorkerBusyError, WorkerClosedError, WorkerCrashedError, WorkerPool, WorkerTimeoutError } from '../../server/modules/files/worker-pool';

type TestTasks = typeof import('../helpers/pool-tasks');
const tasks = new URL('../helpers/pool-tasks.ts', import.meta.url).href;

const pools: WorkerPool<TestTasks>[] = [];
function pool(options: Partial<ConstructorParameters<typeof WorkerPool>[0]> = {}) {
  const p = new WorkerPool<TestTasks>({ name: 'test', maxThreads: 1, maxQueue: 4, memoryMb: 64, timeoutMs: 30_000, tasks, ...options });
  pools.push(p);
  return p;
}
afterAll(async () => {
  await Promise.all(pools.map((p) => p.close()));
});

describe('worker pool (piscina)', () => {
  it('worker pool · a TypeScript task · runs in a thread and hands back its result', async () => {
    expect(await pool().run('echo', { value: 21 })).toEqual({ value: 21, doubled: 42 });
  });

  it('worker pool · a task past its time limit · stopped with its thread; the next task runs', async () => {
    const p = pool();
    await expect(p.run('spin', undefined as never, 300)).rejects.toBeInstanceOf(WorkerTimeoutError);
    expect(await p.run('echo', { value: 1 })).toEqual({ value: 1, doubled: 2 });
  });

  it('worker pool · a task outgrowing the thread memory limit (resourceLimits) · fails alone; the next task runs', async () => {
    const p = pool({ memoryMb: 32 });
    await expect(p.run('hoard', undefined as never)).rejects.toBeInstanceOf(WorkerCrashedError);
    expect(await p.run('echo', { value: 2 })).toEqual({ value: 2, doubled: 4 });
  });

  it('worker pool · tasks waiting in the queue · the time limit starts only when a thread takes the task', async () => {
    // twelve 300 ms tasks on one thread: the last waits 3.3 s in all, each runs far inside its 3 s limit
    const p = pool({ timeoutMs: 3_000, maxQueue: 14 });
    await p.run('echo', { value: 0 }); // the thread is up
    const outcomes = await Promise.allSettled(Array.from({ length: 12 }, () => p.run('busy', { ms: 300 })));
    expect(outcomes.map((o) => o.status)).toEqual(Array(12).fill('fulfilled'));
  });

  it('worker pool · work beyond its queue bound · refused instead of piling up', async () => {
    // one thread and one place in the queue: the third task at once is refused
    const p = pool({ maxQueue: 1, timeoutMs: 1_500 });
    const outcomes = await Promise.all(Array.from({ length: 3 }, () => p.run('spin', undefined as never).catch((e: unknown) => e)));
    expect(outcomes[0]).toBeInstanceOf(WorkerTimeoutError);
    expect(outcomes[1]).toBeInstanceOf(WorkerTimeoutError);
    expect(outcomes[2]).toBeInstanceOf(WorkerBusyError);
    expect(p.pending).toBe(0);
  });

  it('worker pool · closing with running and waiting tasks · rejected as closed, not as failures of the task', async () => {
    const p = pool({ timeoutMs: 10_000 });
    await p.run('echo', { value: 0 });
    const running = p.run('busy', { ms: 5_000 }).catch((e: unknown) => e);
    const waiting = p.run('echo', { value: 1 }).catch((e: unknown) => e);
    await new Promise((r) => setTimeout(r, 100));
    await p.close();
    expect(await running).toBeInstanceOf(WorkerClosedError);
    expect(await waiting).toBeInstanceOf(WorkerClosedError);
    await expect(p.run('echo', { value: 2 })).rejects.toBeInstanceOf(WorkerClosedError);
  });
});
