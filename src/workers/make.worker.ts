// Makes the part being typed in off the page's main thread: the same generators the server runs
// (shared/make), measured with the same analysis, so the preview keeps up without the form stuttering.
import { GENERATORS, toStl, type Generator } from '@shared/make';
import { analyseTriangles } from '@shared/mesh';
import { fieldErrors } from '@shared/validation';
import type { MakeJob, MakeReply } from '@/lib/makePreview';

const reply = (message: MakeReply, transfer: Transferable[] = []) =>
  (globalThis as unknown as { postMessage(m: MakeReply, t: Transferable[]): void }).postMessage(message, transfer);

addEventListener('message', (event) => {
  const { id, kind, params, corrections } = (event as MessageEvent<MakeJob>).data;
  const generator = (GENERATORS as Record<string, Generator | undefined>)[kind];
  if (!generator) return reply({ id, ok: false, fields: {}, message: `There is no maker called "${kind}".` });
  const parsed = generator.schema.safeParse(params);
  if (!parsed.success) return reply({ id, ok: false, fields: fieldErrors(parsed.error), message: 'Some sizes need another look.' });
  try {
    const made = generator.generate(parsed.data as never, corrections);
    const stl = toStl(made.mesh);
    const buffer = stl.buffer.slice(stl.byteOffset, stl.byteOffset + stl.byteLength) as ArrayBuffer;
    reply(
      { id, ok: true, analysis: analyseTriangles(made.mesh.positions), drawn: made.drawn, warnings: made.warnings, loadBearing: made.loadBearing, stl: buffer },
      [buffer],
    );
  } catch (err) {
    reply({ id, ok: false, fields: {}, message: (err as Error).message });
  }
});
