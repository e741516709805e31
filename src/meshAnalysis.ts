// The submit form's model measurement: the same shared analysis the server runs, in a Web Worker
// (called through comlink) where the browser has one, and on the main thread where it has not
// (e.g. in unit tests).
import { transfer, wrap, type Remote } from 'comlink';
import { analyseModelFile, MeshError, type MeshErrorCode, type ModelFileAnalysis } from '@shared/mesh';
import type { MeshWorkerApi } from './workers/mesh.worker';

export type MeshReply = { ok: true; analysis: ModelFileAnalysis } | { ok: false; code: MeshErrorCode | null; message: string };

let worker: Remote<MeshWorkerApi> | null = null;

function meshWorker(): Remote<MeshWorkerApi> | null {
  if (typeof Worker === 'undefined') return null;
  worker ??= wrap<MeshWorkerApi>(new Worker(new URL('./workers/mesh.worker.ts', import.meta.url), { type: 'module' }));
  return worker;
}

/** Measures a model file; throws MeshError with the contributor-facing message when it is not a usable mesh. */
export async function analyseModel(file: Blob, options: { drawnInInches: boolean }): Promise<ModelFileAnalysis> {
  const bytes = await file.arrayBuffer();
  const w = meshWorker();
  if (!w) return analyseModelFile(new Uint8Array(bytes), options);
  const reply = await w.analyse(transfer(bytes, [bytes]), options.drawnInInches);
  if (reply.ok) return reply.analysis;
  throw reply.code ? new MeshError(reply.code, reply.message) : new Error(reply.message);
}
