// Runs in a worker thread: reads a stored model file, slices it at a recipe's layer height and
// measures every layer (shared/slice.ts), so a large mesh never blocks the event loop.
import { readFile } from 'node:fs/promises';
import { parentPort } from 'node:worker_threads';
import { isZip, parse3mf, parseStl } from '@shared/mesh';
import { sliceProfile, type SliceProfile, type SliceSettings } from '@shared/slice';

export interface SliceJob {
  id: number;
  path: string;
  /** Millimetres per STL unit (25.4 for a part drawn in inches); 3MF declares its own. */
  stlUnitScale: number;
  settings: SliceSettings;
}

export type SliceResult = { id: number; ok: true; profile: SliceProfile } | { id: number; ok: false; error: string };

export async function sliceFile(job: Omit<SliceJob, 'id'>): Promise<SliceProfile> {
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

parentPort?.on('message', (job: SliceJob) => {
  sliceFile(job).then(
    (profile) => parentPort!.postMessage({ id: job.id, ok: true, profile } satisfies SliceResult),
    (err: unknown) => parentPort!.postMessage({ id: job.id, ok: false, error: err instanceof Error ? err.message : String(err) } satisfies SliceResult),
  );
});
