// Over 350 lines on purpose: the whole 3MF reader (a bounded ZIP reader, the XML scan, the object and
// build resolution), each step guarding the limits of the next; nothing else reads ZIP or model XML.
import { Inflate } from 'fflate';
import { MODEL_LIMITS } from '../uploads';
import { describeNonMeshBytes, PositionCollector } from './stl';
import { type FacetSink, MeshError } from './types';

/** Millimetres per unit, for the units the 3MF Core Specification allows on <model unit="…">. */
export const THREEMF_UNIT_MM = {
  micron: 0.001,
  millimeter: 1,
  centimeter: 10,
  inch: 25.4,
  foot: 304.8,
  meter: 1000,
} as const;
export type ThreeMfUnit = keyof typeof THREEMF_UNIT_MM;

const MODEL_RELATIONSHIP = 'http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel';
const CORE_NAMESPACE = 'http://schemas.microsoft.com/3dmanufacturing/core/2015/02';
const DEFAULT_MODEL_PART = '3D/3dmodel.model';
const ROOT_RELS_PART = '_rels/.rels';
// The caps are what a printable part needs (see MODEL_LIMITS for the reasoning).
const DEFAULT_MAX_UNCOMPRESSED = MODEL_LIMITS.maxUnpackedBytes;
const DEFAULT_MAX_TRIANGLES = MODEL_LIMITS.maxTriangles;
// Deflate cannot do better than about 1032:1, so a larger declared ratio means the sizes lie.
const MAX_COMPRESSION_RATIO = 1100;
// Real exporters nest components two or three deep; the bound keeps the recursion off the stack limit.
const MAX_COMPONENT_DEPTH = 32;
// Compressed bytes handed to the inflater at a time: at most ~17 MB of output before the budget is checked again.
const INFLATE_CHUNK = 16 * 1024;

export interface Read3mfOptions {
  /** Refuse the archive if the entries read would inflate beyond this many bytes. Default MODEL_LIMITS.maxUnpackedBytes. */
  maxUncompressedBytes?: number;
  /** Refuse builds that expand (through repeated items and components) beyond this many triangles. Default MODEL_LIMITS.maxTriangles. */
  maxTriangles?: number;
}

export interface ThreeMfModel {
  unit: ThreeMfUnit;
  /** Millimetres per model unit. */
  unitScale: number;
  /** Triangles in the build, after expanding items and components. */
  triangleCount: number;
  /** Hands every build triangle to the sink, transformed into model space (model units, not yet mm). */
  emit(sink: FacetSink): void;
}

export function isZip(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
}

/** Opens a 3MF package, reads its root model and resolves the build. Throws MeshError when it cannot. */
export function read3mf(bytes: Uint8Array, options: Read3mfOptions = {}): ThreeMfModel {
  if (bytes.length === 0) throw new MeshError('empty', 'The file is empty (0 bytes); the upload or the export did not complete — export it again.');
  if (!isZip(bytes)) {
    const other = describeNonMeshBytes(bytes);
    throw new MeshError(
      'not_zip',
      `This is not a 3MF file: a 3MF is a ZIP archive, but this ${other ? `appears to be ${other}` : 'does not start like one'}. Export the part as 3MF (or STL) again.`,
    );
  }
  const zip = new ZipReader(bytes, options.maxUncompressedBytes ?? DEFAULT_MAX_UNCOMPRESSED);
  const maxTriangles = options.maxTriangles ?? DEFAULT_MAX_TRIANGLES;
  const rootPath = rootModelPart(zip);
  const parts = new Map<string, ModelPart>();
  // triangles stored in the model parts, counted while reading so a huge raw mesh stops early
  const stored = { triangles: 0, max: maxTriangles };
  const loadPart = (path: string): ModelPart => {
    let part = parts.get(path);
    if (!part) {
      const name = zip.find(path);
      if (!name) throw new MeshError('no_model', `The 3MF refers to a model part "${path}" that is not in the archive; export it again.`);
      part = parseModelPart(new TextDecoder().decode(zip.read(name)), name, stored);
      parts.set(path, part);
    }
    return part;
  };
  const root = loadPart(rootPath);
  const build = new BuildResolver(root, rootPath, loadPart);
  // counted from the object graph (components × build items) before a single triangle is placed
  const triangleCount = build.countTriangles();
  if (triangleCount === 0) {
    throw new MeshError('no_triangles', 'The 3MF model has no triangles to print (its build is empty or its objects have no mesh); export it again.');
  }
  if (triangleCount > maxTriangles) {
    const shown = triangleCount < 1e15 ? triangleCount.toLocaleString('en-US') : 'more than a quadrillion';
    throw new MeshError(
      'too_large',
      `The 3MF build expands to ${shown} triangles, more than the ${maxTriangles.toLocaleString('en-US')} we accept; simplify the mesh or reduce repeated copies.`,
    );
  }
  return { unit: root.unit, unitScale: THREEMF_UNIT_MM[root.unit], triangleCount, emit: (sink) => build.emit(sink) };
}

export interface Parsed3mf {
  unit: ThreeMfUnit;
  unitScale: number;
  /** 9 numbers per build triangle, in model units (multiply by unitScale for mm). */
  positions: Float64Array;
}

export function parse3mf(bytes: Uint8Array, options: Read3mfOptions = {}): Parsed3mf {
  const model = read3mf(bytes, options);
  const collector = new PositionCollector('float64', model.triangleCount);
  model.emit(collector);
  return { unit: model.unit, unitScale: model.unitScale, positions: collector.positions() as Float64Array };
}

// ---------------------------------------------------------------------------
// The ZIP container

interface ZipEntry {
  name: string;
  method: number;
  flags: number;
  compressedSize: number;
  originalSize: number;
  localHeader: number;
}

/**
 * Reads single entries on demand, refusing any that would inflate past the budget (zip bombs):
 * declared sizes are checked before inflating, and inflating stops as soon as an entry outgrows
 * what it declared, so a lying header cannot make it run on.
 */
class ZipReader {
  readonly names: string[];
  private readonly entries: Map<string, ZipEntry>;
  private remaining: number;

  constructor(
    private readonly bytes: Uint8Array,
    private readonly maxBytes: number,
  ) {
    this.remaining = maxBytes;
    this.entries = readCentralDirectory(bytes);
    this.names = [...this.entries.keys()];
  }

  /** The entry's real name, matched case-insensitively as OPC part names are. */
  find(path: string): string | undefined {
    if (this.entries.has(path)) return path;
    const lower = path.toLowerCase();
    return this.names.find((name) => name.toLowerCase() === lower);
  }

  read(name: string): Uint8Array {
    const entry = this.entries.get(name)!;
    if (entry.originalSize > this.remaining) {
      throw new MeshError(
        'zip_bomb',
        `The 3MF entry "${name}" would inflate to ${mb(entry.originalSize)}, beyond the ${mb(this.maxBytes)} we unpack; the file is refused.`,
      );
    }
    if (entry.compressedSize > 0 && entry.originalSize / entry.compressedSize > MAX_COMPRESSION_RATIO) {
      throw new MeshError(
        'zip_bomb',
        `The 3MF entry "${name}" claims to inflate ${Math.round(entry.originalSize / entry.compressedSize).toLocaleString('en-US')} times its stored size, which no real model does; the file is refused.`,
      );
    }
    this.remaining -= entry.originalSize;
    const data = entryData(this.bytes, entry);
    if (entry.method === 0) {
      if (data.length !== entry.originalSize) throw damaged(`entry "${name}" is stored with the wrong size`);
      return data;
    }
    if (entry.method !== 8) throw damaged(`entry "${name}" uses compression method ${entry.method}, which 3MF does not allow`);
    return inflateWithin(data, entry.originalSize, name);
  }
}

const damaged = (detail: string) => new MeshError('bad_zip', `The 3MF archive is damaged and cannot be unpacked (${detail}); export it again.`);

// ZIP structures after PKWARE's APPNOTE.TXT 6.3: end of central directory (4.3.16), its ZIP64
// locator and record (4.3.14–15), central directory headers (4.3.12), the ZIP64 extra field (4.5.3)
// and local file headers (4.3.7).
const EOCD = 0x06054b50;
const ZIP64_LOCATOR = 0x07064b50;
const ZIP64_EOCD = 0x06064b50;
const CENTRAL_HEADER = 0x02014b50;
const LOCAL_HEADER = 0x04034b50;
const MAX32 = 0xffffffff;

function readCentralDirectory(bytes: Uint8Array): Map<string, ZipEntry> {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const u16 = (at: number) => view.getUint16(at, true);
  const u32 = (at: number) => view.getUint32(at, true);
  const u64 = (at: number) => Number(view.getBigUint64(at, true));
  const need = (at: number, length: number) => {
    if (at < 0 || at + length > bytes.length) throw damaged('a directory record points past the end of the file');
  };

  let eocd = -1;
  for (let at = bytes.length - 22; at >= 0 && at >= bytes.length - 22 - 0xffff; at--) {
    if (u32(at) === EOCD) {
      eocd = at;
      break;
    }
  }
  if (eocd < 0) throw damaged('no end of central directory; the file is cut off or not a ZIP');
  let count = u16(eocd + 10);
  let offset = u32(eocd + 16);
  if (eocd >= 20 && u32(eocd - 20) === ZIP64_LOCATOR) {
    const record = u64(eocd - 12);
    need(record, 56);
    if (u32(record) !== ZIP64_EOCD) throw damaged('the ZIP64 directory record is missing');
    count = u64(record + 32);
    offset = u64(record + 48);
  }

  const entries = new Map<string, ZipEntry>();
  for (let i = 0, at = offset; i < count; i++) {
    need(at, 46);
    if (u32(at) !== CENTRAL_HEADER) throw damaged('a central directory header is missing');
    const flags = u16(at + 8);
    const nameLength = u16(at + 28);
    const extraLength = u16(at + 30);
    const commentLength = u16(at + 32);
    need(at + 46, nameLength + extraLength);
    const nameBytes = bytes.subarray(at + 46, at + 46 + nameLength);
    const name = flags & 0x800 ? new TextDecoder().decode(nameBytes) : String.fromCharCode(...nameBytes);
    const entry: ZipEntry = { name, flags, method: u16(at + 10), compressedSize: u32(at + 20), originalSize: u32(at + 24), localHeader: u32(at + 42) };
    if (entry.originalSize === MAX32 || entry.compressedSize === MAX32 || entry.localHeader === MAX32) {
      readZip64Extra(view, at + 46 + nameLength, extraLength, entry);
    }
    if (flags & 0x1) throw damaged(`entry "${name}" is encrypted`);
    entries.set(name, entry);
    at += 46 + nameLength + extraLength + commentLength;
  }
  return entries;
}

function readZip64Extra(view: DataView, start: number, length: number, entry: ZipEntry): void {
  for (let at = start; at + 4 <= start + length;) {
    const id = view.getUint16(at, true);
    const size = view.getUint16(at + 2, true);
    if (id === 0x0001) {
      let field = at + 4;
      const next = () => {
        if (field + 8 > at + 4 + size) throw damaged(`the ZIP64 sizes of entry "${entry.name}" are incomplete`);
        const value = Number(view.getBigUint64(field, true));
        field += 8;
        return value;
      };
      if (entry.originalSize === MAX32) entry.originalSize = next();
      if (entry.compressedSize === MAX32) entry.compressedSize = next();
      if (entry.localHeader === MAX32) entry.localHeader = next();
      return;
    }
    at += 4 + size;
  }
  throw damaged(`entry "${entry.name}" lacks its ZIP64 sizes`);
}

function entryData(bytes: Uint8Array, entry: ZipEntry): Uint8Array {
  const at = entry.localHeader;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (at + 30 > bytes.length || view.getUint32(at, true) !== LOCAL_HEADER) throw damaged(`the local header of entry "${entry.name}" is missing`);
  const start = at + 30 + view.getUint16(at + 26, true) + view.getUint16(at + 28, true);
  if (start + entry.compressedSize > bytes.length) throw damaged(`entry "${entry.name}" is cut off`);
  return bytes.subarray(start, start + entry.compressedSize);
}

/** Inflates a DEFLATE entry in small steps, stopping as soon as it outgrows its declared size. */
function inflateWithin(data: Uint8Array, declared: number, name: string): Uint8Array {
  const out = new Uint8Array(declared);
  let length = 0;
  const inflater = new Inflate((chunk) => {
    if (length + chunk.length > declared) {
      throw new MeshError(
        'zip_bomb',
        `The 3MF entry "${name}" inflates beyond the ${mb(declared)} its directory declares, so its sizes lie; the file is refused.`,
      );
    }
    out.set(chunk, length);
    length += chunk.length;
  });
  try {
    if (data.length === 0) inflater.push(data, true);
    for (let at = 0; at < data.length; at += INFLATE_CHUNK) inflater.push(data.subarray(at, at + INFLATE_CHUNK), at + INFLATE_CHUNK >= data.length);
  } catch (error) {
    if (error instanceof MeshError) throw error;
    throw damaged(error instanceof Error ? error.message : String(error));
  }
  if (length !== declared) throw damaged(`entry "${name}" inflates to ${length} bytes, not the ${declared} its directory declares`);
  return out;
}

const mb = (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(1)} MB`;

/** The part named by the root 3D-model relationship in _rels/.rels, else the conventional 3D/3dmodel.model. */
function rootModelPart(zip: ZipReader): string {
  const rels = zip.find(ROOT_RELS_PART);
  if (rels) {
    let target: string | undefined;
    scanXml(new TextDecoder().decode(zip.read(rels)), (name, attrText) => {
      if (target || localName(name) !== 'Relationship') return;
      const attrs = parseAttributes(attrText);
      if (attrs.Type === MODEL_RELATIONSHIP && attrs.Target) target = partName(attrs.Target);
    });
    if (target && zip.find(target)) return target;
  }
  if (zip.find(DEFAULT_MODEL_PART)) return DEFAULT_MODEL_PART;
  const listed = zip.names.slice(0, 8).join(', ') + (zip.names.length > 8 ? ', …' : '');
  throw new MeshError(
    'no_model',
    `The archive holds no 3D model part (expected one named in _rels/.rels or ${DEFAULT_MODEL_PART}; found ${listed || 'nothing'}). It is not a 3MF model — export the part as 3MF again.`,
  );
}

/** "/3D/My%20Part.model" → "3D/My Part.model" (zip entries have no leading slash). */
function partName(target: string): string {
  const path = target.replace(/^\/+/, '');
  try {
    return decodeURIComponent(path);
  } catch {
    return path;
  }
}

// ---------------------------------------------------------------------------
// Model XML. The 3MF model schema is plain enough for a tag scanner: no DOM needed.

// Comments, CDATA, declarations, then ordinary tags. Attribute text excludes '<' so a stray
// quote cannot make the scan quadratic.
const TAG = /<!--[\s\S]*?-->|<!\[CDATA\[[\s\S]*?\]\]>|<[?!][^<>]*>|<(\/?)([A-Za-z_][\w.:-]*)((?:[^<>"']|"[^"<]*"|'[^'<]*')*)>/g;
const ATTRIBUTE = /([A-Za-z_][\w.:-]*)\s*=\s*(?:"([^"]*)"|'([^']*)')/g;

function scanXml(xml: string, onOpen: (name: string, attrText: string) => void, onClose?: (name: string) => void): void {
  TAG.lastIndex = 0;
  for (let m = TAG.exec(xml); m !== null; m = TAG.exec(xml)) {
    const name = m[2];
    if (name === undefined) continue;
    if (m[1]) {
      onClose?.(name);
      continue;
    }
    const attrText = m[3];
    const selfClosing = attrText.endsWith('/');
    onOpen(name, selfClosing ? attrText.slice(0, -1) : attrText);
    if (selfClosing) onClose?.(name);
  }
}

function parseAttributes(text: string): Record<string, string> {
  const attrs: Record<string, string> = {};
  ATTRIBUTE.lastIndex = 0;
  for (let m = ATTRIBUTE.exec(text); m !== null; m = ATTRIBUTE.exec(text)) {
    attrs[m[1]] = decodeEntities(m[2] ?? m[3]);
  }
  return attrs;
}

const ENTITY = /&(?:#x([0-9a-f]+)|#(\d+)|(amp|lt|gt|quot|apos));/gi;
const NAMED_ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

function decodeEntities(value: string): string {
  if (!value.includes('&')) return value;
  return value.replace(ENTITY, (_, hex?: string, dec?: string, named?: string) => {
    if (named) return NAMED_ENTITIES[named.toLowerCase()];
    const code = hex ? parseInt(hex, 16) : Number(dec);
    return code <= 0x10ffff ? String.fromCodePoint(code) : '\ufffd';
  });
}

function localName(qualified: string): string {
  const colon = qualified.indexOf(':');
  return colon < 0 ? qualified : qualified.slice(colon + 1);
}

/** 3MF row-vector affine transform: m00 m01 m02 m10 m11 m12 m20 m21 m22 m30 m31 m32; p' = [x y z 1] · M. */
type Matrix = Float64Array;

interface Placement {
  objectId: string;
  /** Model part holding the object (the production extension's path attribute), or undefined for the same part. */
  path: string | undefined;
  transform: Matrix | null;
}

interface ObjectDef {
  id: string;
  vertices: Float64Array;
  triangles: Uint32Array;
  components: Placement[];
}

interface ModelPart {
  unit: ThreeMfUnit;
  objects: Map<string, ObjectDef>;
  items: Placement[];
}

function parseModelPart(xml: string, partPath: string, stored: { triangles: number; max: number }): ModelPart {
  const builder = new ModelPartBuilder(partPath, stored);
  scanXml(
    xml,
    (name, attrText) => builder.open(name, attrText),
    () => builder.close(),
  );
  return builder.result();
}

/** Follows the element nesting and collects objects, their meshes and components, and build items. */
class ModelPartBuilder {
  private unit: string | null = null;
  private readonly objects = new Map<string, ObjectDef>();
  private readonly items: Placement[] = [];
  private readonly stack: (string | null)[] = [];
  private readonly corePrefixes = new Set<string>();
  private current: { id: string; vertices: NumberList; triangles: NumberList; components: Placement[] } | null = null;

  constructor(
    private readonly partPath: string,
    private readonly stored: { triangles: number; max: number },
  ) {}

  open(qualified: string, attrText: string): void {
    if (this.stack.length === 0) this.learnPrefixes(attrText);
    const name = this.coreName(qualified);
    const parent = this.stack.length > 0 ? this.stack[this.stack.length - 1] : undefined;
    this.stack.push(name);
    if (name === null) return;

    if (name === 'vertex' && parent === 'vertices' && this.current) {
      const attrs = parseAttributes(attrText);
      const list = this.current.vertices;
      const index = list.length / 3;
      list.push(this.number(attrs, 'x', 'vertex', index));
      list.push(this.number(attrs, 'y', 'vertex', index));
      list.push(this.number(attrs, 'z', 'vertex', index));
    } else if (name === 'triangle' && parent === 'triangles' && this.current) {
      const attrs = parseAttributes(attrText);
      const list = this.current.triangles;
      const index = list.length / 3;
      if (++this.stored.triangles > this.stored.max) {
        throw new MeshError(
          'too_large',
          `The 3MF model stores more than ${this.stored.max.toLocaleString('en-US')} triangles, the most we accept; simplify the mesh.`,
        );
      }
      list.push(this.index(attrs, 'v1', index));
      list.push(this.index(attrs, 'v2', index));
      list.push(this.index(attrs, 'v3', index));
    } else if (name === 'object' && parent === 'resources') {
      const attrs = parseAttributes(attrText);
      this.current = { id: attrs.id ?? '', vertices: new NumberList(), triangles: new NumberList(), components: [] };
    } else if (name === 'component' && parent === 'components' && this.current) {
      this.current.components.push(this.placement(parseAttributes(attrText), 'component'));
    } else if (name === 'item' && parent === 'build') {
      this.items.push(this.placement(parseAttributes(attrText), 'build item'));
    } else if (name === 'model' && parent === undefined) {
      this.unit = parseAttributes(attrText).unit ?? 'millimeter';
    }
  }

  close(): void {
    const name = this.stack.pop();
    if (name === 'object' && this.current) {
      const { id, vertices, triangles, components } = this.current;
      const vertexArray = vertices.toFloat64();
      const triangleArray = triangles.toFloat64();
      checkIndices(id, triangleArray, vertexArray.length / 3);
      this.objects.set(id, { id, vertices: vertexArray, triangles: Uint32Array.from(triangleArray), components });
      this.current = null;
    }
  }

  result(): ModelPart {
    if (this.unit === null) {
      throw new MeshError('no_model', `The part "${this.partPath}" is not 3MF model XML (no <model> element); export the file again.`);
    }
    if (!Object.hasOwn(THREEMF_UNIT_MM, this.unit)) {
      throw new MeshError(
        'bad_unit',
        `The 3MF model declares unit="${this.unit}", which is not one of ${Object.keys(THREEMF_UNIT_MM).join(', ')}; export it again.`,
      );
    }
    return { unit: this.unit as ThreeMfUnit, objects: this.objects, items: this.items };
  }

  /** Prefixes bound to the core namespace on the root element; unprefixed names are taken as core. */
  private learnPrefixes(attrText: string): void {
    for (const [key, value] of Object.entries(parseAttributes(attrText))) {
      if (key.startsWith('xmlns:') && value === CORE_NAMESPACE) this.corePrefixes.add(key.slice(6));
    }
  }

  /** Extension elements (other prefixes) may reuse names such as "vertex", so they map to null and are skipped. */
  private coreName(qualified: string): string | null {
    const colon = qualified.indexOf(':');
    if (colon < 0) return qualified;
    return this.corePrefixes.has(qualified.slice(0, colon)) ? qualified.slice(colon + 1) : null;
  }

  private number(attrs: Record<string, string>, key: string, element: string, index: number): number {
    const raw = attrs[key];
    const value = raw === undefined || raw.trim() === '' ? NaN : Number(raw);
    if (Number.isFinite(value)) return value;
    throw new MeshError(
      'bad_number',
      `In the 3MF model, ${element} ${index + 1} of object ${this.current?.id} has ${raw === undefined ? `no ${key} attribute` : `${key}="${raw}", which is not a finite number`}; the file is damaged — export it again.`,
    );
  }

  private index(attrs: Record<string, string>, key: string, triangle: number): number {
    const value = this.number(attrs, key, 'triangle', triangle);
    if (Number.isInteger(value) && value >= 0) return value;
    throw new MeshError(
      'bad_number',
      `In the 3MF model, triangle ${triangle + 1} of object ${this.current?.id} has ${key}="${attrs[key]}", which is not a vertex number; the file is damaged — export it again.`,
    );
  }

  private placement(attrs: Record<string, string>, what: string): Placement {
    const pathKey = Object.keys(attrs).find((key) => key.endsWith(':path'));
    return {
      objectId: attrs.objectid ?? '',
      path: pathKey ? partName(attrs[pathKey]) : undefined,
      transform: parseTransform(attrs.transform, what),
    };
  }
}

function checkIndices(objectId: string, t: Float64Array, vertexCount: number): void {
  for (let i = 0; i < t.length; i++) {
    if (t[i] >= vertexCount) {
      throw new MeshError(
        'index_out_of_range',
        `In the 3MF model, triangle ${Math.floor(i / 3) + 1} of object ${objectId} uses vertex ${t[i]}, but the object has only ${vertexCount} vertices (numbered from 0); the file is damaged — export it again.`,
      );
    }
  }
}

function parseTransform(raw: string | undefined, what: string): Matrix | null {
  if (raw === undefined) return null;
  const parts = raw.trim().split(/\s+/);
  const values = parts.map(Number);
  if (parts.length !== 12 || values.some((v) => !Number.isFinite(v))) {
    throw new MeshError(
      'bad_transform',
      `A ${what} in the 3MF model has transform="${raw}", which is not 12 numbers (a 3×4 matrix); the file is damaged — export it again.`,
    );
  }
  return Float64Array.from(values);
}

/** The transform that applies `first` and then `then`. */
function compose(first: Matrix | null, then: Matrix | null): Matrix | null {
  if (!first) return then;
  if (!then) return first;
  const out = new Float64Array(12);
  for (let row = 0; row < 4; row++) {
    const x = first[row * 3],
      y = first[row * 3 + 1],
      z = first[row * 3 + 2];
    const w = row === 3 ? 1 : 0; // the last row is a point (translation), the others directions
    for (let col = 0; col < 3; col++) {
      out[row * 3 + col] = x * then[col] + y * then[3 + col] + z * then[6 + col] + w * then[9 + col];
    }
  }
  return out;
}

function determinant(m: Matrix): number {
  return m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
}

function transformVertices(v: Float64Array, m: Matrix): Float64Array {
  const out = new Float64Array(v.length);
  for (let i = 0; i < v.length; i += 3) {
    const x = v[i],
      y = v[i + 1],
      z = v[i + 2];
    out[i] = x * m[0] + y * m[3] + z * m[6] + m[9];
    out[i + 1] = x * m[1] + y * m[4] + z * m[7] + m[10];
    out[i + 2] = x * m[2] + y * m[5] + z * m[8] + m[11];
  }
  return out;
}

/** Expands build items and (recursively) components into placed meshes. */
class BuildResolver {
  private readonly counts = new Map<ObjectDef, number>();

  constructor(
    private readonly root: ModelPart,
    private readonly rootPath: string,
    private readonly loadPart: (path: string) => ModelPart,
  ) {}

  /** Build items, or every object with a mesh once when the build lists none. */
  private placements(): Placement[] {
    if (this.root.items.length > 0) return this.root.items;
    return [...this.root.objects.values()].filter((def) => def.triangles.length > 0).map((def) => ({ objectId: def.id, path: undefined, transform: null }));
  }

  countTriangles(): number {
    let total = 0;
    for (const item of this.placements()) total += this.countObject(this.lookup(item, this.rootPath), new Set());
    return total;
  }

  emit(sink: FacetSink): void {
    for (const item of this.placements()) this.emitObject(this.lookup(item, this.rootPath), item.transform, sink);
  }

  private lookup(placement: Placement, fromPath: string): { def: ObjectDef; path: string } {
    const path = placement.path ?? fromPath;
    const part = path === this.rootPath ? this.root : this.loadPart(path);
    const def = part.objects.get(placement.objectId);
    if (!def) {
      throw new MeshError(
        'unknown_object',
        `The 3MF model places object "${placement.objectId}", which it never defines; the file is damaged — export it again.`,
      );
    }
    return { def, path };
  }

  /** Memoised per object, so shared components cannot make counting exponential. */
  private countObject({ def, path }: { def: ObjectDef; path: string }, visiting: Set<ObjectDef>): number {
    const known = this.counts.get(def);
    if (known !== undefined) return known;
    if (visiting.has(def)) {
      throw new MeshError(
        'component_cycle',
        `Object ${def.id} in the 3MF model contains itself through its components; the file is damaged — export it again.`,
      );
    }
    if (visiting.size >= MAX_COMPONENT_DEPTH) {
      throw new MeshError(
        'too_deep',
        `The 3MF model nests components more than ${MAX_COMPONENT_DEPTH} deep, which no printable part needs; flatten it and export it again.`,
      );
    }
    visiting.add(def);
    let total = def.triangles.length / 3;
    for (const component of def.components) total += this.countObject(this.lookup(component, path), visiting);
    visiting.delete(def);
    this.counts.set(def, total);
    return total;
  }

  private emitObject({ def, path }: { def: ObjectDef; path: string }, transform: Matrix | null, sink: FacetSink): void {
    if (def.triangles.length > 0) emitMesh(def, transform, sink);
    for (const component of def.components) {
      this.emitObject(this.lookup(component, path), compose(component.transform, transform), sink);
    }
  }
}

function emitMesh(def: ObjectDef, transform: Matrix | null, sink: FacetSink): void {
  const v = transform ? transformVertices(def.vertices, transform) : def.vertices;
  // A mirroring transform turns the facets inside out; swapping two corners keeps them facing outwards.
  const mirrored = transform !== null && determinant(transform) < 0;
  const t = def.triangles;
  for (let i = 0; i < t.length; i += 3) {
    const a = t[i] * 3;
    const b = (mirrored ? t[i + 2] : t[i + 1]) * 3;
    const c = (mirrored ? t[i + 1] : t[i + 2]) * 3;
    sink.addFacet(v[a], v[a + 1], v[a + 2], v[b], v[b + 1], v[b + 2], v[c], v[c + 1], v[c + 2]);
  }
}

/** A growable list of numbers, stored compactly. */
class NumberList {
  length = 0;
  private data = new Float64Array(64);

  push(value: number): void {
    if (this.length === this.data.length) {
      const bigger = new Float64Array(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = value;
  }

  toFloat64(): Float64Array {
    return this.data.slice(0, this.length);
  }
}
