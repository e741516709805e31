// The submit form's model measurement: the same shared analysis the server runs, in a Web Worker
// (workers/mesh.worker.ts, called through comlink) where the browser has one, and on the main thread
// where it has not (e.g. in unit tests).
import { wrap, transfer, type Remote } from 'comlink';
import { analyseModelFile, MeshError, type ModelFileAnalysis } from '@shared/mesh';
import type { MeshWorker } from '@/workers/mesh.worker';

let worker: Remote<MeshWorker> | null = null;

function meshWorker(): Remote<MeshWorker> | null {
  if (typeof Worker === 'undefined') return null;
  worker ??= wrap<MeshWorker>(new Worker(new URL('../workers/mesh.worker.ts', import.meta.url), { type: 'module' }));
  return worker;
}

/** Measures a model file; throws MeshError with the contributor-facing message when it is not a usable mesh. */
export async function analyseModel(file: Blob, options: { drawnInInches: boolean }): Promise<ModelFileAnalysis> {
  const bytes = await file.arrayBuffer();
  const w = meshWorker();
  if (!w) return analyseModelFile(new Uint8Array(bytes), options);
  const outcome = await w.analyse(transfer(bytes, [bytes]), options.drawnInInches);
  if (outcome.ok) return outcome.analysis;
  throw outcome.code ? new MeshError(outcome.code, outcome.message) : new Error(outcome.message);
}
