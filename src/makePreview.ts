// The make pages' live preview: the part is generated in a Web Worker (workers/make.worker.ts, called
// through comlink). Only the newest request matters: an older one resolves with null as soon as a
// newer one is asked, and its reply is dropped, so the page never shows a stale preview.
import { wrap, type Remote } from 'comlink';
import type { Corrections, Drawn } from '@shared/make';
import type { MeshAnalysis } from '@shared/mesh';
import type { MakeWorkerApi } from './workers/make.worker';

export type MakeReply =
  | { ok: true; analysis: MeshAnalysis; drawn: Drawn; warnings: string[]; loadBearing: boolean; stl: ArrayBuffer }
  | { ok: false; fields: Record<string, string>; message: string };

export type MadePreview = Extract<MakeReply, { ok: true }>;

let worker: Remote<MakeWorkerApi> | null = null;
let newest = 0;
let overtaken: (() => void) | null = null;

/** Makes the part in the worker; resolves with null when a newer request overtook this one. */
export function makeInWorker(kind: string, params: Record<string, unknown>, corrections: Corrections): Promise<MakeReply | null> {
  overtaken?.();
  const id = ++newest;
  worker ??= wrap<MakeWorkerApi>(new Worker(new URL('./workers/make.worker.ts', import.meta.url), { type: 'module' }));
  const made = worker.make(kind, JSON.parse(JSON.stringify(params)), corrections).then((reply) => (id === newest ? reply : null));
  const dropped = new Promise<null>((resolve) => (overtaken = () => resolve(null)));
  return Promise.race([made, dropped]);
}
