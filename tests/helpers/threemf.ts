// Hostile 3MF packages (3MF Core Specification: an OPC ZIP with [Content_Types].xml, _rels/.rels and
// a <model> part) for the upload limits.
import { zipSync } from 'fflate';
import { crc32, createDeflateRaw } from 'node:zlib';

const CORE = 'http://schemas.microsoft.com/3dmanufacturing/core/2015/02';
const MODEL_REL = 'http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel';
const CONTENT_TYPES = `<?xml version="1.0" encoding="UTF-8"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">
  <Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>
  <Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/>
</Types>`;
const RELS = `<?xml version="1.0" encoding="UTF-8"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">
  <Relationship Target="/3D/3dmodel.model" Id="rel0" Type="${MODEL_REL}"/>
</Relationships>`;
const encode = (text: string) => new TextEncoder().encode(text);

/** A 10 mm cube (12 triangles) as 3MF mesh XML. */
function cubeMesh(size = 10): string {
  const vertices = Array.from({ length: 8 }, (_, i) => `<vertex x="${i & 1 ? size : 0}" y="${i & 2 ? size : 0}" z="${i & 4 ? size : 0}"/>`);
  const quads = [
    [0, 2, 3, 1],
    [4, 5, 7, 6],
    [0, 1, 5, 4],
    [2, 6, 7, 3],
    [0, 4, 6, 2],
    [1, 3, 7, 5],
  ];
  const triangles = quads.flatMap(([a, b, c, d]) => [`<triangle v1="${a}" v2="${b}" v3="${c}"/>`, `<triangle v1="${a}" v2="${c}" v3="${d}"/>`]);
  return `<mesh><vertices>${vertices.join('')}</vertices><triangles>${triangles.join('')}</triangles></mesh>`;
}

export function modelPackage(resources: string, build: string): Uint8Array {
  const model = `<?xml version="1.0" encoding="UTF-8"?><model unit="millimeter" xmlns="${CORE}"><resources>${resources}</resources><build>${build}</build></model>`;
  return zipSync({ '[Content_Types].xml': encode(CONTENT_TYPES), '_rels/.rels': encode(RELS), '3D/3dmodel.model': encode(model) });
}

/**
 * A cube placed `fanout` times in each of `levels` nested component objects: a few kilobytes that
 * expand to 12 × fanout^levels triangles. Each copy is shifted 20 mm so the placements are distinct.
 */
export function nestedComponents3mf(levels: number, fanout: number): Uint8Array {
  const objects = [`<object id="1" type="model">${cubeMesh()}</object>`];
  for (let level = 1; level <= levels; level++) {
    const components = Array.from({ length: fanout }, (_, i) => `<component objectid="${level}" transform="1 0 0 0 1 0 0 0 1 ${(i * 20) % 1000} 0 0"/>`);
    objects.push(`<object id="${level + 1}" type="model"><components>${components.join('')}</components></object>`);
  }
  return modelPackage(objects.join(''), `<item objectid="${levels + 1}"/>`);
}

/** Components nested `depth` deep, one inside the other around a single cube. */
export function deeplyNested3mf(depth: number): Uint8Array {
  const objects = [`<object id="1" type="model">${cubeMesh()}</object>`];
  for (let level = 1; level <= depth; level++)
    objects.push(`<object id="${level + 1}" type="model"><components><component objectid="${level}"/></components></object>`);
  return modelPackage(objects.join(''), `<item objectid="${depth + 1}"/>`);
}

/** A ZIP local header + central directory entry pair (PKWARE APPNOTE.TXT 4.3.7 and 4.3.12). */
function zipEntry(name: string, data: Uint8Array, method: 0 | 8, crc: number, size: number, offset: number) {
  const nameBytes = Buffer.from(name, 'utf8');
  const local = Buffer.alloc(30);
  local.writeUInt32LE(0x04034b50, 0);
  local.writeUInt16LE(20, 4);
  local.writeUInt16LE(0x800, 6);
  local.writeUInt16LE(method, 8);
  local.writeUInt32LE(crc >>> 0, 14);
  local.writeUInt32LE(data.length, 18);
  local.writeUInt32LE(size, 22);
  local.writeUInt16LE(nameBytes.length, 26);
  const central = Buffer.alloc(46);
  central.writeUInt32LE(0x02014b50, 0);
  central.writeUInt16LE(20, 4);
  central.writeUInt16LE(20, 6);
  central.writeUInt16LE(0x800, 8);
  central.writeUInt16LE(method, 10);
  central.writeUInt32LE(crc >>> 0, 16);
  central.writeUInt32LE(data.length, 20);
  central.writeUInt32LE(size, 24);
  central.writeUInt16LE(nameBytes.length, 28);
  central.writeUInt32LE(offset, 42);
  return { local: Buffer.concat([local, nameBytes, data]), central: Buffer.concat([central, nameBytes]) };
}

/**
 * A real 3MF whose model part is `mebibytes` MiB of spaces, deflated (zlib at level 9): 480 MiB
 * packs into about 490 KB. Built in 1 MiB steps so the test never holds the inflated bytes.
 */
export async function hugeEntry3mf(mebibytes: number): Promise<Buffer> {
  const chunk = Buffer.alloc(1024 * 1024, 0x20);
  const deflate = createDeflateRaw({ level: 9, memLevel: 9 });
  const out: Buffer[] = [];
  deflate.on('data', (c: Buffer) => out.push(c));
  const ended = new Promise((r) => deflate.on('end', r));
  let crc = 0;
  for (let i = 0; i < mebibytes; i++) {
    crc = crc32(chunk, crc);
    if (!deflate.write(chunk)) await new Promise((r) => deflate.once('drain', r));
  }
  deflate.end();
  await ended;
  const files: [string, Uint8Array, 0 | 8, number, number][] = [
    ['[Content_Types].xml', encode(CONTENT_TYPES), 0, crc32(encode(CONTENT_TYPES)), encode(CONTENT_TYPES).length],
    ['_rels/.rels', encode(RELS), 0, crc32(encode(RELS)), encode(RELS).length],
    ['3D/3dmodel.model', Buffer.concat(out), 8, crc, mebibytes * 1024 * 1024],
  ];
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const [name, data, method, entryCrc, size] of files) {
    const entry = zipEntry(name, data, method, entryCrc, size, offset);
    locals.push(entry.local);
    centrals.push(entry.central);
    offset += entry.local.length;
  }
  const directory = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(files.length, 8);
  end.writeUInt16LE(files.length, 10);
  end.writeUInt32LE(directory.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, directory, end]);
}
