// Measures a model file off the page's main thread, so a large STL does not freeze the submit form.
import { analyseModelFile, MeshError } from '@shared/mesh';
import type { MeshJob, MeshReply } from '@/lib/meshAnalysis';

const reply = (message: MeshReply) => (globalThis as unknown as { postMessage(m: MeshReply): void }).postMessage(message);

addEventListener('message', (event) => {
  const { id, bytes, drawnInInches } = (event as MessageEvent<MeshJob>).data;
  try {
    reply({ id, ok: true, analysis: analyseModelFile(new Uint8Array(bytes), { drawnInInches }) });
  } catch (err) {
    reply({ id, ok: false, code: err instanceof MeshError ? err.code : null, message: (err as Error).message });
  }
});
