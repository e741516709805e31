// Measures a model file off the page's main thread, so a large STL does not freeze the submit form.
import { expose } from 'comlink';
import { analyseModelFile, MeshError } from '@shared/mesh';
import type { MeshReply } from '@/meshAnalysis';

const api = {
  analyse(bytes: ArrayBuffer, drawnInInches: boolean): MeshReply {
    try {
      return { ok: true, analysis: analyseModelFile(new Uint8Array(bytes), { drawnInInches }) };
    } catch (err) {
      return { ok: false, code: err instanceof MeshError ? err.code : null, message: (err as Error).message };
    }
  },
};
export type MeshWorkerApi = typeof api;

expose(api);
