// The first module of every worker-pool thread. From the sources the tasks are TypeScript: they load
// through tsx's loader, which the thread lacks under vitest (and re-registering under tsx is
// harmless). The compiled server (dist-server/) hands over a .js module and needs no loader.
import { workerData } from 'node:worker_threads';

if (workerData.tasks.endsWith('.ts')) {
  const { register } = await import('tsx/esm/api');
  register();
}
let tasks;

/** Piscina calls this with { task, input }: the name of an export of the tasks module and its argument. */
export default async function run({ task, input }) {
  tasks ??= import(workerData.tasks);
  const module = await tasks;
  if (typeof module[task] !== 'function') throw new Error(`the worker has no task "${task}"`);
  return module[task](input);
}
