// Measures a model file off the page's main thread, so a large STL does not freeze the submit form.
// Called through comlink (lib/meshAnalysis.ts); a mesh error comes back as a value, with its code.
import { expose } from 'comlink';
import { analyseModelFile, MeshError, type MeshErrorCode, type ModelFileAnalysis } from '@shared/mesh';

export type MeshOutcome = { ok: true; analysis: ModelFileAnalysis } | { ok: false; code: MeshErrorCode | null; message: string };

const api = {
  analyse(bytes: ArrayBuffer, drawnInInches: boolean): MeshOutcome {
    try {
      return { ok: true, analysis: analyseModelFile(new Uint8Array(bytes), { drawnInInches }) };
    } catch (err) {
      return { ok: false, code: err instanceof MeshError ? err.code : null, message: (err as Error).message };
    }
  },
};
export type MeshWorker = typeof api;

expose(api);
