// The make pages' live preview: the part is generated in a Web Worker (workers/make.worker.ts). Only
// the newest request matters: a reply to an older one is dropped, so fast typing never queues up work
// on the page.
import type { Corrections, Drawn } from '@shared/make';
import type { MeshAnalysis } from '@shared/mesh';

export interface MakeJob {
  id: number;
  kind: string;
  params: Record<string, unknown>;
  corrections: Corrections;
}

export type MakeReply =
  | { id: number; ok: true; analysis: MeshAnalysis; drawn: Drawn; warnings: string[]; loadBearing: boolean; stl: ArrayBuffer }
  | { id: number; ok: false; fields: Record<string, string>; message: string };

export type MadePreview = Extract<MakeReply, { ok: true }>;

let worker: Worker | null = null;
let nextId = 0;
let latest: ((reply: MakeReply | null) => void) | null = null;

function makeWorker(): Worker {
  if (!worker) {
    worker = new Worker(new URL('../workers/make.worker.ts', import.meta.url), { type: 'module' });
    worker.addEventListener('message', (event: MessageEvent<MakeReply>) => {
      if (event.data.id === nextId) latest?.(event.data);
    });
  }
  return worker;
}

/** Makes the part in the worker; resolves with null when a newer request overtook this one. */
export function makeInWorker(kind: string, params: Record<string, unknown>, corrections: Corrections): Promise<MakeReply | null> {
  latest?.(null);
  const id = ++nextId;
  return new Promise((resolve) => {
    latest = resolve;
    makeWorker().postMessage({ id, kind, params: JSON.parse(JSON.stringify(params)), corrections } satisfies MakeJob);
  });
}
