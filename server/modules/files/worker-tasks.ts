// The tasks the worker pool runs (see worker-pool.ts); each export takes one plain argument and
// returns structured-cloneable data. Relative imports only: this module is loaded inside worker threads.
import { MeshError, type MeshErrorCode, type ModelFileAnalysis } from '../../../shared/mesh';
import { analyseModelPath } from './analyse-model';

export { processPhoto, verifyPhoto } from './photo-worker';
export { renderModel } from './render-model';

export type ModelCheck = { ok: true; analysis: ModelFileAnalysis } | { ok: false; code: MeshErrorCode; message: string };

/** Reads and measures an STL or 3MF; a file that cannot be analysed comes back as { ok: false } with the contributor's message. */
export async function analyseModel({ path, drawnInInches }: { path: string; drawnInInches: boolean }): Promise<ModelCheck> {
  try {
    return { ok: true, analysis: await analyseModelPath(path, { drawnInInches }) };
  } catch (err) {
    if (err instanceof MeshError) return { ok: false, code: err.code, message: err.message };
    throw err;
  }
}
