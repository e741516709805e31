// Makes the part being typed in off the page's main thread: the same generators the server runs
// (shared/make), measured with the same analysis, so the preview keeps up without the form stuttering.
// Called through comlink (lib/makePreview.ts); the STL's bytes are handed over, not copied.
import { expose, transfer } from 'comlink';
import { GENERATORS, toStl, type Corrections, type Drawn, type Generator } from '@shared/make';
import { analyseTriangles, type MeshAnalysis } from '@shared/mesh';
import { fieldErrors } from '@shared/validation';

export type MakeReply =
  | { ok: true; analysis: MeshAnalysis; drawn: Drawn; warnings: string[]; loadBearing: boolean; stl: ArrayBuffer }
  | { ok: false; fields: Record<string, string>; message: string };

const api = {
  make(kind: string, params: Record<string, unknown>, corrections: Corrections): MakeReply {
    const generator = (GENERATORS as Record<string, Generator | undefined>)[kind];
    if (!generator) return { ok: false, fields: {}, message: `There is no maker called "${kind}".` };
    const parsed = generator.schema.safeParse(params);
    if (!parsed.success) return { ok: false, fields: fieldErrors(parsed.error), message: 'Some sizes need another look.' };
    try {
      const made = generator.generate(parsed.data as never, corrections);
      const stl = toStl(made.mesh);
      const buffer = stl.buffer.slice(stl.byteOffset, stl.byteOffset + stl.byteLength) as ArrayBuffer;
      const reply: MakeReply = {
        ok: true,
        analysis: analyseTriangles(made.mesh.positions),
        drawn: made.drawn,
        warnings: made.warnings,
        loadBearing: made.loadBearing,
        stl: buffer,
      };
      return transfer(reply, [buffer]);
    } catch (err) {
      return { ok: false, fields: {}, message: (err as Error).message };
    }
  },
};
export type MakeWorker = typeof api;

expose(api);
