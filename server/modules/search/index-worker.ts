// Runs in a worker thread: builds the search index from plain documents, writes the index file
// (to a temporary name, then renamed, so a reader never sees half a file) and hands the index back.
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { dirname } from 'node:path';
import { parentPort } from 'node:worker_threads';
import { buildIndex, indexFileContent, type SearchBody, type SearchDocument } from './index-builder';

export interface BuildJob {
  id: number;
  documents: SearchDocument[];
  bodies: SearchBody[];
  fingerprint: string;
  /** Where to save the index; null builds without saving. */
  file: string | null;
}

export type BuildResult =
  | { id: number; ok: true; index: object; buildMs: number; writeError: string | null }
  | { id: number; ok: false; error: string };

export async function writeAtomically(file: string, content: string): Promise<void> {
  await mkdir(dirname(file), { recursive: true });
  const temp = `${file}.${process.pid}.${Date.now()}.tmp`;
  try {
    await writeFile(temp, content);
    await rename(temp, file);
  } catch (err) {
    await rm(temp, { force: true });
    throw err;
  }
}

async function build(job: BuildJob): Promise<BuildResult> {
  const started = performance.now();
  const index = buildIndex(job.documents);
  const json = index.toJSON();
  const buildMs = performance.now() - started;
  let writeError: string | null = null;
  if (job.file) {
    try {
      await writeAtomically(job.file, indexFileContent(job.documents, job.fingerprint, json, job.bodies));
    } catch (err) {
      writeError = (err as Error).message;
    }
  }
  return { id: job.id, ok: true, index: json, buildMs, writeError };
}

parentPort?.on('message', (job: BuildJob) => {
  build(job)
    .then((result) => parentPort!.postMessage(result))
    .catch((err: Error) => parentPort!.postMessage({ id: job.id, ok: false, error: err.message } satisfies BuildResult));
});
