// The slicing pool's task (see files/worker-pool.ts): reads a stored model file, slices it at a
// recipe's layer height and measures every layer (shared/slice.ts), so a large mesh never blocks the
// event loop. Relative imports only: this module is loaded inside worker threads.
import { readFile } from 'node:fs/promises';
import { isZip, parse3mf, parseStl } from '../../../shared/mesh';
import { sliceProfile, type SliceProfile, type SliceSettings } from '../../../shared/slice';

export interface SliceJob {
  path: string;
  /** Millimetres per STL unit (25.4 for a part drawn in inches); 3MF declares its own. */
  stlUnitScale: number;
  settings: SliceSettings;
}

export async function sliceFile(job: SliceJob): Promise<SliceProfile> {
  const bytes = await readFile(job.path);
  let positions: Float32Array | Float64Array;
  let scale: number;
  if (isZip(bytes)) {
    const model = parse3mf(bytes);
    positions = model.positions;
    scale = model.unitScale;
  } else {
    positions = parseStl(bytes).positions;
    scale = job.stlUnitScale;
  }
  if (scale !== 1) for (let i = 0; i < positions.length; i++) positions[i] *= scale;
  return sliceProfile(positions, job.settings);
}
