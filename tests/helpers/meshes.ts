// Test meshes made by an independent CAD library (@jscad/modeling) and serialised as STL by its own
// serializer, so the analysis is checked against files we did not write ourselves.
import jscad from '@jscad/modeling';
import stlSerializer from '@jscad/stl-serializer';

const { primitives, transforms } = jscad;

function toBuffer(parts: (ArrayBuffer | string)[]): Buffer {
  return Buffer.concat(parts.map((p) => (typeof p === 'string' ? Buffer.from(p, 'utf8') : Buffer.from(p))));
}

export function cubeStl(size = 20, binary = true): Buffer {
  return toBuffer(stlSerializer.serialize({ binary }, primitives.cuboid({ size: [size, size, size] })));
}

export function boxStl(x: number, y: number, z: number): Buffer {
  return toBuffer(stlSerializer.serialize({ binary: true }, transforms.translate([0, 0, z / 2], primitives.cuboid({ size: [x, y, z] }))));
}

/** A binary STL box with the winding of its first `reversed` facets turned backwards (second and third corners swapped). */
export function boxStlWithReversedFacets(x: number, y: number, z: number, reversed: number): Buffer {
  const bytes = Buffer.from(boxStl(x, y, z));
  for (let f = 0; f < reversed; f++) {
    const second = 84 + 50 * f + 24;
    const copy = Buffer.from(bytes.subarray(second, second + 12));
    bytes.copy(bytes, second, second + 12, second + 24);
    copy.copy(bytes, second + 12);
  }
  return bytes;
}
