// The make pool's task (see worker-pool.ts): generate a part, measure it and, when asked, write the
// file. Relative imports only: this module is loaded inside worker threads.
import { analyseTriangles, type MeshAnalysis } from '../../../shared/mesh';
import { GENERATORS, to3mf, toStl, type Corrections, type Drawn, type Generator } from '../../../shared/make';
import type { MakeFormat } from '../../../shared/schemas/make';

export interface MakeJob {
  kind: string;
  /** Already checked against the generator's schema on the main thread. */
  params: unknown;
  corrections: Corrections;
  /** Also return the file in this format. */
  format?: MakeFormat;
}

export interface MakeResult {
  analysis: MeshAnalysis;
  drawn: Drawn;
  warnings: string[];
  loadBearing: boolean;
  file: Uint8Array | null;
}

function bytesOf(out: Uint8Array | ArrayBuffer | string): Uint8Array {
  if (typeof out === 'string') return new TextEncoder().encode(out);
  return out instanceof Uint8Array ? out : new Uint8Array(out);
}

export function makePart(job: MakeJob): MakeResult {
  const generator = (GENERATORS as Record<string, Generator | undefined>)[job.kind];
  if (!generator) throw new Error(`no generator "${job.kind}"`);
  const made = generator.generate(job.params as never, job.corrections);
  const analysis = analyseTriangles(made.mesh.positions);
  const file = job.format === '3mf' ? bytesOf(to3mf(made.mesh)) : job.format === 'stl' ? bytesOf(toStl(made.mesh)) : null;
  return { analysis, drawn: made.drawn, warnings: made.warnings, loadBearing: made.loadBearing, file };
}
