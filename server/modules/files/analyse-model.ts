// Analyses a model file from disk without holding a second copy of it: a binary STL (the common
// large upload) is read in 1 MB pieces straight into the analysis, anything else is read once
// and handed over as it is. Relative imports only: the upload-check worker pool loads this module.
import { open } from 'node:fs/promises';
import {
  analyseModelFile,
  checkPrintableSize,
  BINARY_STL_FACET_BYTES,
  BINARY_STL_PREFIX_BYTES,
  MeshAccumulator,
  MM_PER_INCH,
  readBinaryStlFacets,
  type AnalyseFileOptions,
  type ModelFileAnalysis,
} from '../../../shared/mesh';

const FACETS_PER_READ = 20_000;
/** Below this the whole file is read at once: no memory to save, and one code path for small files. */
const STREAM_FROM_BYTES = 4 * 1024 * 1024;

export async function analyseModelPath(path: string, options: Pick<AnalyseFileOptions, 'drawnInInches'> = {}): Promise<ModelFileAnalysis> {
  const handle = await open(path, 'r');
  try {
    const { size } = await handle.stat();
    if (size >= STREAM_FROM_BYTES) {
      const prefix = new Uint8Array(BINARY_STL_PREFIX_BYTES);
      await handle.read(prefix, 0, prefix.length, 0);
      const declared = new DataView(prefix.buffer).getUint32(80, true);
      // Binary iff the size is exactly 84 + 50·n (the same rule detectStlFormat applies).
      if (declared > 0 && BINARY_STL_PREFIX_BYTES + BINARY_STL_FACET_BYTES * declared === size) {
        return await streamBinaryStl(handle, declared, options.drawnInInches ? MM_PER_INCH : 1);
      }
    }
    return analyseModelFile(await handle.readFile(), options);
  } finally {
    await handle.close();
  }
}

async function streamBinaryStl(handle: Awaited<ReturnType<typeof open>>, facets: number, unitScale: number): Promise<ModelFileAnalysis> {
  const acc = new MeshAccumulator(facets);
  const chunk = new Uint8Array(FACETS_PER_READ * BINARY_STL_FACET_BYTES);
  for (let first = 0; first < facets; first += FACETS_PER_READ) {
    const count = Math.min(FACETS_PER_READ, facets - first);
    const bytes = count * BINARY_STL_FACET_BYTES;
    let filled = 0;
    while (filled < bytes) {
      const { bytesRead } = await handle.read(chunk, filled, bytes - filled, BINARY_STL_PREFIX_BYTES + first * BINARY_STL_FACET_BYTES + filled);
      if (bytesRead === 0) throw new Error('The model file shrank while it was being read.');
      filled += bytesRead;
    }
    readBinaryStlFacets(chunk.subarray(0, bytes), first, acc);
  }
  return checkPrintableSize({ ...acc.finish(unitScale), format: 'stl-binary', unitScale });
}
