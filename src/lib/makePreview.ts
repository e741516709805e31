// The make pages' live preview: the part is generated in a Web Worker (workers/make.worker.ts, called
// through comlink). Only the newest request matters: the answer to an older one comes back as null,
// so fast typing never shows a stale part.
import { wrap, type Remote } from 'comlink';
import type { Corrections } from '@shared/make';
import type { MakeReply, MakeWorker } from '@/workers/make.worker';

export type { MakeReply } from '@/workers/make.worker';
export type MadePreview = Extract<MakeReply, { ok: true }>;

let worker: Remote<MakeWorker> | null = null;
let newest = 0;

/** Makes the part in the worker; resolves with null when a newer request overtook this one. */
export async function makeInWorker(kind: string, params: Record<string, unknown>, corrections: Corrections): Promise<MakeReply | null> {
  const mine = ++newest;
  worker ??= wrap<MakeWorker>(new Worker(new URL('../workers/make.worker.ts', import.meta.url), { type: 'module' }));
  // the form's values may be reactive proxies, which cannot be cloned into the worker
  const reply = await worker.make(kind, JSON.parse(JSON.stringify(params)) as Record<string, unknown>, corrections);
  return mine === newest ? reply : null;
}
