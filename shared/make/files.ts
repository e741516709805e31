import stlSerializer from '@jscad/stl-serializer';
import threeMfSerializer from '@jscad/3mf-serializer';
import type { GeneratedMesh } from './types';
import { solidOfMesh } from './solid';

function joined(parts: (ArrayBuffer | string)[]): Uint8Array {
  const chunks = parts.map((p) => (typeof p === 'string' ? new TextEncoder().encode(p) : new Uint8Array(p)));
  const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  let o = 0;
  for (const c of chunks) {
    out.set(c, o);
    o += c.length;
  }
  return out;
}

/** Binary STL (millimetres by convention; STL declares no unit). */
export function toStl(mesh: GeneratedMesh): Uint8Array {
  return joined(stlSerializer.serialize({ binary: true }, solidOfMesh(mesh)));
}

/** 3MF package declaring millimetres; no creation date, so the same part gives the same bytes. */
export function to3mf(mesh: GeneratedMesh): Uint8Array {
  return joined(threeMfSerializer.serialize({ unit: 'millimeter', metadata: false, compress: true }, solidOfMesh(mesh)));
}
