// The first module of every worker-pool thread. The tasks are TypeScript: this loads them through
// tsx's loader, which the thread lacks under vitest (and re-registering under tsx is harmless).
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
let tasks;

/** Piscina calls this with { task, input }: the name of an export of the tasks module and its argument. */
export default async function run({ task, input }) {
  tasks ??= import(workerData.tasks);
  const module = await tasks;
  if (typeof module[task] !== 'function') throw new Error(`the worker has no task "${task}"`);
  return module[task](input);
}
