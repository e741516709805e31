// The submit form's model measurement: the same shared analysis the server runs, in a Web Worker
// where the browser has one (and on the main thread where it has not, e.g. in unit tests).
import { analyseModelFile, MeshError, type MeshErrorCode, type ModelFileAnalysis } from '@shared/mesh';

export interface MeshJob {
  id: number;
  bytes: ArrayBuffer;
  drawnInInches: boolean;
}

export type MeshReply = { id: number; ok: true; analysis: ModelFileAnalysis } | { id: number; ok: false; code: MeshErrorCode | null; message: string };

let worker: Worker | null = null;
let nextId = 0;
const waiting = new Map<number, (reply: MeshReply) => void>();

function meshWorker(): Worker | null {
  if (typeof Worker === 'undefined') return null;
  if (!worker) {
    worker = new Worker(new URL('../workers/mesh.worker.ts', import.meta.url), { type: 'module' });
    worker.addEventListener('message', (event: MessageEvent<MeshReply>) => {
      waiting.get(event.data.id)?.(event.data);
      waiting.delete(event.data.id);
    });
  }
  return worker;
}

/** Measures a model file; throws MeshError with the contributor-facing message when it is not a usable mesh. */
export async function analyseModel(file: Blob, options: { drawnInInches: boolean }): Promise<ModelFileAnalysis> {
  const bytes = await file.arrayBuffer();
  const w = meshWorker();
  if (!w) return analyseModelFile(new Uint8Array(bytes), options);
  const id = ++nextId;
  const reply = await new Promise<MeshReply>((resolve) => {
    waiting.set(id, resolve);
    w.postMessage({ id, bytes, drawnInInches: options.drawnInInches } satisfies MeshJob, [bytes]);
  });
  if (reply.ok) return reply.analysis;
  throw reply.code ? new MeshError(reply.code, reply.message) : new Error(reply.message);
}
