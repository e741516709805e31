// Over 350 lines on purpose: both STL encodings, and the sniffing and error wording that tell them apart.
import { type FacetSink, MeshError } from './types';

export type StlFormat = 'stl-binary' | 'stl-ascii';

const HEADER_BYTES = 80;
const BINARY_PREFIX = HEADER_BYTES + 4;
const FACET_BYTES = 50;
const TEXT_SNIFF_BYTES = 512;

const count = (n: number) => n.toLocaleString('en-US');

// ---------------------------------------------------------------------------
// Deciding what the bytes are

export function declaredFacetCount(bytes: Uint8Array): number {
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(HEADER_BYTES, true);
}

/** Binary iff the size is exactly 84 + 50·n; the header may begin with "solid", so the first word proves nothing. */
export function isBinaryStlSize(bytes: Uint8Array): boolean {
  return bytes.length >= BINARY_PREFIX && BINARY_PREFIX + FACET_BYTES * declaredFacetCount(bytes) === bytes.length;
}

/** Throws a MeshError saying what is wrong when the bytes are not a usable STL. */
export function detectStlFormat(bytes: Uint8Array): StlFormat {
  if (bytes.length === 0) {
    throw new MeshError('empty', 'The file is empty (0 bytes); the upload or the export did not complete — export it again.');
  }
  if (isBinaryStlSize(bytes)) {
    if (declaredFacetCount(bytes) === 0) throw noFacets();
    return 'stl-binary';
  }
  const other = describeNonMeshBytes(bytes);
  if (other) {
    throw new MeshError('not_a_mesh', `This file appears to be ${other}, not an STL mesh. ${adviceFor(other)}`);
  }
  if (looksLikeText(bytes)) {
    if (startsWithSolid(bytes)) return 'stl-ascii';
    throw new MeshError(
      'not_a_mesh',
      'This is a text file but not an ASCII STL, which must begin with the word "solid". Export the part as STL or 3MF and upload that file.',
    );
  }
  throw binarySizeError(bytes);
}

const SIGNATURES: ReadonlyArray<readonly [string, string]> = [
  ['\x89PNG\r\n\x1a\n', 'a PNG image'],
  ['\xff\xd8\xff', 'a JPEG image'],
  ['GIF87a', 'a GIF image'],
  ['GIF89a', 'a GIF image'],
  ['II*\x00', 'a TIFF image'],
  ['MM\x00*', 'a TIFF image'],
  ['%PDF-', 'a PDF document'],
  ['PK\x03\x04', 'a ZIP archive'],
  ['PK\x05\x06', 'a ZIP archive'],
  ['\x1f\x8b', 'a gzip-compressed file'],
  ['7z\xbc\xaf\x27\x1c', 'a 7z archive'],
  ['Rar!\x1a\x07', 'a RAR archive'],
];

/** Names common non-mesh file types by their magic bytes, or returns null. */
export function describeNonMeshBytes(bytes: Uint8Array): string | null {
  for (const [magic, description] of SIGNATURES) {
    if (startsWithBytes(bytes, magic, 0)) return description;
  }
  if (startsWithBytes(bytes, 'RIFF', 0) && startsWithBytes(bytes, 'WEBP', 8)) return 'a WebP image';
  const head = latin1(bytes, 0, 64).trimStart().toLowerCase();
  if (head.startsWith('<!doctype html') || head.startsWith('<html')) return 'an HTML web page';
  if (head.startsWith('<?xml')) return 'an XML document';
  return null;
}

function adviceFor(description: string): string {
  if (description === 'a ZIP archive') {
    return 'If it is a 3MF model, upload it with the .3mf extension; otherwise unpack it and upload the STL inside.';
  }
  if (description === 'an HTML web page') {
    return 'A web page was probably saved instead of the model file; download the model itself and upload that.';
  }
  return 'It may have been renamed by mistake; export the part as STL or 3MF and upload that file.';
}

function binarySizeError(bytes: Uint8Array): MeshError {
  if (bytes.length < BINARY_PREFIX) {
    return new MeshError(
      'too_short',
      `The file is only ${bytes.length} bytes: too short for a binary STL (at least 84 bytes) and not ASCII STL text (which begins with "solid") — export it again.`,
    );
  }
  const declared = declaredFacetCount(bytes);
  const expected = BINARY_PREFIX + FACET_BYTES * declared;
  const holds = Math.floor((bytes.length - BINARY_PREFIX) / FACET_BYTES);
  if (expected > bytes.length) {
    return new MeshError(
      'truncated',
      `The STL says it has ${count(declared)} facets but the file holds only ${count(holds)}; the upload was probably cut off — export it again.`,
    );
  }
  return new MeshError(
    'count_mismatch',
    `The STL says it has ${count(declared)} facets (${count(expected)} bytes) but the file is ${count(bytes.length)} bytes, and it is not ASCII STL either; the file is damaged — export it again.`,
  );
}

function noFacets(): MeshError {
  return new MeshError('no_facets', 'The STL holds no facets (an empty mesh); check the part was selected when exporting and export it again.');
}

function startsWithBytes(bytes: Uint8Array, magic: string, at: number): boolean {
  if (bytes.length < at + magic.length) return false;
  for (let i = 0; i < magic.length; i++) {
    if (bytes[at + i] !== magic.charCodeAt(i)) return false;
  }
  return true;
}

function latin1(bytes: Uint8Array, from: number, to: number): string {
  return String.fromCharCode(...bytes.subarray(from, Math.min(to, bytes.length)));
}

function startsWithSolid(bytes: Uint8Array): boolean {
  return /^(\xef\xbb\xbf)?\s*solid(\s|$)/i.test(latin1(bytes, 0, 64)); // optional UTF-8 byte-order mark
}

/** Binary STL facets soon contain control bytes (zeros in floats and counts); text has none but whitespace. */
function looksLikeText(bytes: Uint8Array): boolean {
  const end = Math.min(bytes.length, TEXT_SNIFF_BYTES);
  for (let i = 0; i < end; i++) {
    const b = bytes[i];
    if (b < 9 || (b > 13 && b < 32) || b === 127) return false;
  }
  return true;
}

// ---------------------------------------------------------------------------
// Reading

/** Reads a binary STL in one pass, handing each facet to the sink; returns the facet count. */
export function readBinaryStl(bytes: Uint8Array, sink: FacetSink): number {
  const facets = declaredFacetCount(bytes);
  readBinaryStlFacets(bytes.subarray(BINARY_PREFIX, BINARY_PREFIX + FACET_BYTES * facets), 0, sink);
  return facets;
}

/** Bytes before the first facet of a binary STL, and bytes per facet. */
export const BINARY_STL_PREFIX_BYTES = BINARY_PREFIX;
export const BINARY_STL_FACET_BYTES = FACET_BYTES;

/**
 * Reads whole 50-byte facet records (a binary STL without its 84-byte prefix, or a run of it read
 * in pieces); `firstFacet` is the index of the first record, for error messages.
 */
export function readBinaryStlFacets(records: Uint8Array, firstFacet: number, sink: FacetSink): void {
  const view = new DataView(records.buffer, records.byteOffset, records.byteLength);
  const facets = Math.floor(records.byteLength / FACET_BYTES);
  // Start at the first vertex: the stored normal is ignored because the winding defines it.
  let o = 12;
  for (let f = 0; f < facets; f++, o += FACET_BYTES) {
    const ax = view.getFloat32(o, true),
      ay = view.getFloat32(o + 4, true),
      az = view.getFloat32(o + 8, true);
    const bx = view.getFloat32(o + 12, true),
      by = view.getFloat32(o + 16, true),
      bz = view.getFloat32(o + 20, true);
    const cx = view.getFloat32(o + 24, true),
      cy = view.getFloat32(o + 28, true),
      cz = view.getFloat32(o + 32, true);
    // One test for all nine: float32 values cannot overflow a double sum, so only NaN or ±Infinity makes s − s non-zero.
    const s = ax + ay + az + bx + by + bz + cx + cy + cz;
    if (s - s !== 0) throw nonFiniteFacet(firstFacet + f);
    sink.addFacet(ax, ay, az, bx, by, bz, cx, cy, cz);
  }
}

export function nonFiniteFacet(index: number): MeshError {
  return new MeshError(
    'non_finite',
    `Facet ${count(index + 1)} has a coordinate that is not a finite number (NaN or infinity); the exporter wrote a broken mesh — repair it or export it again.`,
  );
}

/** Reads ASCII STL (one or more solids) into the sink; returns the facet count. */
export function readAsciiStl(bytes: Uint8Array, sink: FacetSink): number {
  const lex = new AsciiLexer(new TextDecoder().decode(bytes));
  let facets = 0;
  for (let tok = lex.next(); tok !== null; tok = lex.next()) {
    if (tok.toLowerCase() !== 'solid') throw lex.syntax(`expected "solid" or the end of the file but found "${clip(tok)}"`);
    lex.skipName('facet', 'endsolid');
    facets += readSolid(lex, sink);
  }
  if (facets === 0) throw noFacets();
  return facets;
}

function readSolid(lex: AsciiLexer, sink: FacetSink): number {
  let facets = 0;
  for (;;) {
    const tok = lex.next();
    if (tok === null) return facets; // a missing "endsolid" loses nothing
    const word = tok.toLowerCase();
    if (word === 'endsolid') {
      lex.skipName('solid');
      return facets;
    }
    if (word !== 'facet') throw lex.syntax(`expected "facet" or "endsolid" but found "${clip(tok)}"`);
    readFacet(lex, sink);
    facets++;
  }
}

function readFacet(lex: AsciiLexer, sink: FacetSink): void {
  const startLine = lex.tokenLine;
  let tok = lex.nextIn(startLine);
  if (tok.toLowerCase() === 'normal') {
    // The normal is implied by the winding; skip its numbers (some writers emit four).
    for (let i = 0; i < 5 && tok.toLowerCase() !== 'outer'; i++) tok = lex.nextIn(startLine);
  }
  lex.expect(tok, 'outer', 'outer loop');
  lex.expect(lex.nextIn(startLine), 'loop', 'outer loop');
  const v = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (let i = 0; i < 9; i += 3) {
    lex.expect(lex.nextIn(startLine), 'vertex', 'vertex x y z');
    v[i] = lex.coordinate(startLine);
    v[i + 1] = lex.coordinate(startLine);
    v[i + 2] = lex.coordinate(startLine);
  }
  tok = lex.nextIn(startLine);
  if (tok.toLowerCase() === 'vertex') {
    throw lex.syntax(`the facet starting on line ${startLine} has more than three vertices; STL facets must be triangles`);
  }
  lex.expect(tok, 'endloop', 'endloop');
  lex.expect(lex.nextIn(startLine), 'endfacet', 'endfacet');
  sink.addFacet(v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7], v[8]);
}

const NAMED_NON_FINITE = /^[+-]?(nan|inf|infinity)$/i;

const clip = (s: string) => (s.length > 40 ? `${s.slice(0, 40)}…` : s);

class AsciiLexer {
  private pos = 0;
  private line = 1;
  /** Line of the token most recently returned. */
  tokenLine = 1;

  constructor(private readonly text: string) {}

  /**
   * Next whitespace-separated token, or null at the end. Control characters (including NUL
   * padding) count as whitespace; a line ends at LF, CR LF or a lone CR.
   */
  next(): string | null {
    const text = this.text;
    const n = text.length;
    let p = this.pos;
    for (; p < n; p++) {
      const c = text.charCodeAt(p);
      if (c === 10) this.line++;
      else if (c === 13 && text.charCodeAt(p + 1) !== 10) this.line++;
      else if (c > 32) break;
    }
    if (p >= n) {
      this.pos = p;
      return null;
    }
    const start = p;
    while (p < n && text.charCodeAt(p) > 32) p++;
    this.pos = p;
    this.tokenLine = this.line;
    return text.slice(start, p);
  }

  /** Like next(), but the end of the file here means the facet was cut off. */
  nextIn(facetLine: number): string {
    const tok = this.next();
    if (tok === null) {
      throw new MeshError(
        'ascii_syntax',
        `The ASCII STL ends in the middle of the facet that starts on line ${facetLine}; the upload was probably cut off — export it again.`,
      );
    }
    return tok;
  }

  /**
   * Skips a solid's name: the rest of the line, but no further than a word that starts what follows
   * (files written on one line, or with line endings we would not see, have no line to end it).
   */
  skipName(...stopWords: string[]): void {
    const text = this.text;
    const n = text.length;
    let p = this.pos;
    for (;;) {
      while (p < n && text.charCodeAt(p) <= 32) {
        const c = text.charCodeAt(p);
        if (c === 10 || c === 13) {
          this.pos = p;
          return;
        }
        p++;
      }
      if (p >= n) break;
      const start = p;
      while (p < n && text.charCodeAt(p) > 32) p++;
      if (stopWords.includes(text.slice(start, p).toLowerCase())) {
        this.pos = start;
        return;
      }
    }
    this.pos = p;
  }

  expect(tok: string, word: string, shown: string): void {
    if (tok.toLowerCase() !== word) throw this.syntax(`expected "${shown}" but found "${clip(tok)}"`);
  }

  coordinate(facetLine: number): number {
    const tok = this.nextIn(facetLine);
    const value = Number(tok);
    if (Number.isFinite(value)) return value;
    if (Number.isNaN(value) && !NAMED_NON_FINITE.test(tok)) throw this.syntax(`"${clip(tok)}" is not a number`);
    throw new MeshError(
      'non_finite',
      `ASCII STL line ${this.tokenLine}: the coordinate "${clip(tok)}" is not a finite number (NaN or infinity); the exporter wrote a broken mesh — repair it or export it again.`,
    );
  }

  syntax(problem: string): MeshError {
    return new MeshError('ascii_syntax', `ASCII STL line ${this.tokenLine}: ${problem}. Fix that line or export the file again.`);
  }
}

// ---------------------------------------------------------------------------
// Plain triangle arrays, for callers that want positions rather than figures

/** Collects facets into a flat array of 9 numbers per triangle. */
export class PositionCollector implements FacetSink {
  private data: Float32Array | Float64Array;
  private length = 0;

  constructor(
    private readonly kind: 'float32' | 'float64',
    expectedFacets = 1024,
  ) {
    this.data = this.allocate(Math.max(9, Math.ceil(expectedFacets) * 9));
  }

  addFacet(ax: number, ay: number, az: number, bx: number, by: number, bz: number, cx: number, cy: number, cz: number): void {
    if (this.length + 9 > this.data.length) this.grow();
    const d = this.data;
    const i = this.length;
    d[i] = ax;
    d[i + 1] = ay;
    d[i + 2] = az;
    d[i + 3] = bx;
    d[i + 4] = by;
    d[i + 5] = bz;
    d[i + 6] = cx;
    d[i + 7] = cy;
    d[i + 8] = cz;
    this.length = i + 9;
  }

  positions(): Float32Array | Float64Array {
    return this.length === this.data.length ? this.data : this.data.slice(0, this.length);
  }

  private allocate(size: number): Float32Array | Float64Array {
    return this.kind === 'float32' ? new Float32Array(size) : new Float64Array(size);
  }

  private grow(): void {
    const bigger = this.allocate(this.data.length * 2);
    bigger.set(this.data);
    this.data = bigger;
  }
}

export interface ParsedStl {
  format: StlFormat;
  /** 9 numbers per facet, in the file's (unstated) unit. Float32 for binary, float64 for ASCII. */
  positions: Float32Array | Float64Array;
  facets: number;
}

export function parseStl(bytes: Uint8Array): ParsedStl {
  const format = detectStlFormat(bytes);
  if (format === 'stl-binary') {
    const collector = new PositionCollector('float32', declaredFacetCount(bytes));
    const facets = readBinaryStl(bytes, collector);
    return { format, positions: collector.positions(), facets };
  }
  const collector = new PositionCollector('float64', bytes.length / 256);
  const facets = readAsciiStl(bytes, collector);
  return { format, positions: collector.positions(), facets };
}
