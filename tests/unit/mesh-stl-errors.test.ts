import jscad from '@jscad/modeling';
import stlSerializer from '@jscad/stl-serializer';
import { describe, expect, it } from 'vitest';
import { analyseModelFile, analyseTriangles, MeshError, type MeshErrorCode, parseStl } from '../../shared/mesh/index';

// Broken uploads must fail with a MeshError whose message tells the contributor what to do.

const encode = (text: string) => new TextEncoder().encode(text);

function binaryCube(): Uint8Array {
  const parts = stlSerializer.serialize({ binary: true }, jscad.primitives.cube({ size: 20 })) as ArrayBuffer[];
  const out = new Uint8Array(parts.reduce((n, p) => n + p.byteLength, 0));
  let offset = 0;
  for (const p of parts) {
    out.set(new Uint8Array(p), offset);
    offset += p.byteLength;
  }
  return out;
}

const asciiCube = () => (stlSerializer.serialize({ binary: false }, jscad.primitives.cube({ size: 20 })) as string[]).join('');

function failure(bytes: Uint8Array, options?: Parameters<typeof analyseModelFile>[1]): MeshError {
  try {
    analyseModelFile(bytes, options);
  } catch (error) {
    expect(error).toBeInstanceOf(MeshError);
    return error as MeshError;
  }
  throw new Error('expected a MeshError');
}

function expectFailure(bytes: Uint8Array, code: MeshErrorCode, message: RegExp, options?: Parameters<typeof analyseModelFile>[1]) {
  const error = failure(bytes, options);
  expect(error.code).toBe(code);
  expect(error.message).toMatch(message);
  // parseStl (the browser preview path) refuses the same bytes the same way
  if (!options?.format || options.format === 'stl') expect(() => parseStl(bytes)).toThrow(error.message);
}

describe('malformed STL uploads', () => {
  it('malformed STL · an empty file · refused', () => {
    expectFailure(new Uint8Array(0), 'empty', /empty \(0 bytes\).*export it again/);
  });

  it('malformed STL · a truncated binary STL · the declared and the present facet counts named', () => {
    const whole = binaryCube();
    expectFailure(
      whole.slice(0, whole.length - 70),
      'truncated',
      /^The STL says it has 12 facets but the file holds only 10; the upload was probably cut off — export it again\.$/,
    );
  });

  it('malformed STL · a truncated binary STL whose header starts with "solid" · called truncated, not bad ASCII', () => {
    const bytes = binaryCube().slice(0, 84 + 50 * 5 + 7);
    bytes.set(encode('solid exported by a CAD program'));
    expectFailure(bytes, 'truncated', /says it has 12 facets but the file holds only 5/);
  });

  it('malformed STL · a facet count that lies (file longer than the count says) · refused', () => {
    const bytes = binaryCube();
    new DataView(bytes.buffer).setUint32(80, 5, true);
    expectFailure(bytes, 'count_mismatch', /says it has 5 facets \(334 bytes\) but the file is 684 bytes.*export it again/);
  });

  it.each([
    ['NaN', Number.NaN],
    ['Infinity', Number.POSITIVE_INFINITY],
    ['-Infinity', Number.NEGATIVE_INFINITY],
  ])('malformed STL · a binary coordinate of %s · refused', (_, value) => {
    const bytes = binaryCube();
    new DataView(bytes.buffer).setFloat32(84 + 50 * 3 + 12 + 4 * 4, value, true); // facet 4, second corner, y
    expectFailure(bytes, 'non_finite', /^Facet 4 has a coordinate that is not a finite number \(NaN or infinity\)/);
  });

  it.each(['nan', 'inf', '-Infinity', '1e999'])('malformed STL · an ASCII coordinate of %s · its line named', (token) => {
    const lines = asciiCube().split('\n');
    lines[3] = `vertex 10 ${token} -10`;
    expectFailure(encode(lines.join('\n')), 'non_finite', new RegExp(`line 4: the coordinate "${token}" is not a finite number`));
  });

  it('malformed STL · NaN handed straight to analyseTriangles · refused', () => {
    const p = new Float64Array(9);
    p[4] = Number.NaN;
    expect(() => analyseTriangles(p)).toThrow(/Facet 1 has a coordinate that is not a finite number/);
  });

  it('malformed STL · zero facets, binary and ASCII · refused', () => {
    const bytes = new Uint8Array(84);
    expectFailure(bytes, 'no_facets', /holds no facets/);
    expectFailure(encode('solid empty\nendsolid empty\n'), 'no_facets', /holds no facets/);
  });

  it('malformed STL · an ASCII STL with a misspelt keyword · the line named', () => {
    const lines = asciiCube().split('\n');
    expect(lines[4]).toMatch(/^vertex /);
    lines[4] = lines[4].replace('vertex', 'vertx');
    expectFailure(
      encode(lines.join('\n')),
      'ascii_syntax',
      /^ASCII STL line 5: expected "vertex x y z" but found "vertx"\. Fix that line or export the file again\.$/,
    );
  });

  it('malformed STL · an ASCII STL with a word where a number belongs · the line named', () => {
    const lines = asciiCube().split('\n');
    lines[3] = 'vertex 10 ten -10';
    expectFailure(encode(lines.join('\n')), 'ascii_syntax', /line 4: "ten" is not a number/);
  });

  it('malformed STL · an ASCII facet with four vertices · refused', () => {
    const lines = asciiCube().split('\n');
    lines.splice(5, 0, 'vertex 1 2 3');
    expectFailure(encode(lines.join('\n')), 'ascii_syntax', /more than three vertices; STL facets must be triangles/);
  });

  it('malformed STL · an ASCII STL cut off mid-facet · says where the facet started', () => {
    const text = asciiCube();
    const cut = text.slice(0, text.indexOf('vertex', text.indexOf('facet', 100)) + 10);
    const startLine = cut.split('\n').findLastIndex((line) => line.startsWith('facet')) + 1;
    expectFailure(encode(cut), 'ascii_syntax', new RegExp(`ends in the middle of the facet that starts on line ${startLine}; the upload was probably cut off`));
  });

  it('malformed STL · a PNG renamed .stl · refused', () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, ...new Array(200).fill(7)]);
    expectFailure(png, 'not_a_mesh', /^This file appears to be a PNG image, not an STL mesh\. It may have been renamed by mistake/);
  });

  it.each([
    ['JPEG', [0xff, 0xd8, 0xff, 0xe0], /a JPEG image/],
    ['PDF', [...encode('%PDF-1.7\n')], /a PDF document/],
    ['HTML', [...encode('  <!DOCTYPE html><html><body>Not found</body></html>')], /an HTML web page.*download the model itself/],
  ])('a %s renamed .stl', (_, head, message) => {
    const bytes = new Uint8Array([...head, ...new Array(300).fill(0x20)]);
    expectFailure(bytes, 'not_a_mesh', message as RegExp);
  });

  it('malformed STL · a ZIP forced through the STL reader · suggests the 3MF extension', () => {
    const bytes = new Uint8Array([0x50, 0x4b, 0x03, 0x04, ...new Array(200).fill(0)]);
    expectFailure(bytes, 'not_a_mesh', /a ZIP archive.*upload it with the \.3mf extension/, { format: 'stl' });
  });

  it('malformed STL · text that is not ASCII STL · refused', () => {
    expectFailure(encode('v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n'), 'not_a_mesh', /text file but not an ASCII STL, which must begin with the word "solid"/);
  });

  it('malformed STL · a tiny binary fragment · refused', () => {
    expectFailure(new Uint8Array([1, 2, 3, 0, 0, 9]), 'too_short', /only 6 bytes: too short for a binary STL/);
  });
});
