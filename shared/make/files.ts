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

/** DOS date of 1980-01-01, the earliest a ZIP entry can carry. */
const ZIP_EPOCH_DATE = (0 << 9) | (1 << 5) | 1;

/**
 * The ZIP writer stamps each entry with the current time; stamping them all 1980-01-01 00:00 makes
 * the same part give the same bytes (the 3MF carries no other date once its metadata is off).
 */
function fixZipTimes(bytes: Uint8Array): Uint8Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let o = 0;
  while (o + 30 <= bytes.length && view.getUint32(o, true) === 0x04034b50) {
    view.setUint16(o + 10, 0, true);
    view.setUint16(o + 12, ZIP_EPOCH_DATE, true);
    o += 30 + view.getUint16(o + 26, true) + view.getUint16(o + 28, true) + view.getUint32(o + 18, true);
  }
  while (o + 46 <= bytes.length && view.getUint32(o, true) === 0x02014b50) {
    view.setUint16(o + 12, 0, true);
    view.setUint16(o + 14, ZIP_EPOCH_DATE, true);
    o += 46 + view.getUint16(o + 28, true) + view.getUint16(o + 30, true) + view.getUint16(o + 32, true);
  }
  return bytes;
}

/** 3MF package declaring millimetres (`<model unit="millimeter">`); no creation date, so the same part gives the same bytes. */
export function to3mf(mesh: GeneratedMesh): Uint8Array {
  return fixZipTimes(joined(threeMfSerializer.serialize({ unit: 'millimeter', metadata: false, compress: true }, solidOfMesh(mesh))));
}
