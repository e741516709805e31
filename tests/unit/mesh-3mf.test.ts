import { zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { analyseModelFile, MeshError, type MeshErrorCode, parse3mf } from '../../shared/mesh/index';
import { deeplyNested3mf, nestedComponents3mf } from '../helpers/threemf';

// 3MF packages are built here with fflate, following the 3MF Core Specification: an OPC ZIP with
// [Content_Types].xml, _rels/.rels pointing at the model part, and <model>/<resources>/<build>.

const CORE = 'http://schemas.microsoft.com/3dmanufacturing/core/2015/02';
const MODEL_REL = 'http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel';
const encode = (text: string) => new TextEncoder().encode(text);

const CONTENT_TYPES = `<?xml version="1.0" encoding="UTF-8"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">
  <Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>
  <Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/>
</Types>`;

const rels = (target: string) => `<?xml version="1.0" encoding="UTF-8"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">
  <Relationship Target="${target}" Id="rel0" Type="${MODEL_REL}"/>
</Relationships>`;

/** Axis-aligned cube from the origin with outward (counter-clockwise from outside) winding. */
function cubeMesh(size: number): string {
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

const cubeObject = (id: number, size: number) => `<object id="${id}" type="model">${cubeMesh(size)}</object>`;

function modelXml(resources: string, build: string, modelAttributes = 'unit="millimeter"'): string {
  return `<?xml version="1.0" encoding="UTF-8"?>
<model ${modelAttributes} xml:lang="en-US" xmlns="${CORE}">
  <resources>${resources}</resources>
  <build>${build}</build>
</model>`;
}

function package3mf(model: string, options: { modelPath?: string; target?: string | null; extra?: Record<string, string> } = {}): Uint8Array {
  const modelPath = options.modelPath ?? '3D/3dmodel.model';
  const files: Record<string, Uint8Array> = { '[Content_Types].xml': encode(CONTENT_TYPES), [modelPath]: encode(model) };
  if (options.target !== null) files['_rels/.rels'] = encode(rels(options.target ?? `/${modelPath}`));
  for (const [name, text] of Object.entries(options.extra ?? {})) files[name] = encode(text);
  return zipSync(files);
}

const cube3mf = (size: number, unit: string | null, item = '<item objectid="1"/>') =>
  package3mf(modelXml(cubeObject(1, size), item, unit === null ? '' : `unit="${unit}"`));

function expectFailure(bytes: Uint8Array, code: MeshErrorCode, message: RegExp, options: Parameters<typeof analyseModelFile>[1] = {}) {
  let caught: unknown;
  try {
    analyseModelFile(bytes, options);
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(MeshError);
  expect((caught as MeshError).code).toBe(code);
  expect((caught as MeshError).message).toMatch(message);
}

/** Rewrites an entry's uncompressed size in the ZIP central directory (PKWARE APPNOTE 4.3.12, offset 24). */
function declareSize(zip: Uint8Array, name: string, originalSize: number): Uint8Array {
  const copy = zip.slice();
  const view = new DataView(copy.buffer);
  for (let i = 0; i + 46 <= copy.length; i++) {
    if (view.getUint32(i, true) !== 0x02014b50) continue;
    const nameLength = view.getUint16(i + 28, true);
    if (new TextDecoder().decode(copy.subarray(i + 46, i + 46 + nameLength)) === name) {
      view.setUint32(i + 24, originalSize, true);
      return copy;
    }
  }
  throw new Error(`no central directory entry for ${name}`);
}

describe('3MF units (3MF Core Specification §3.4)', () => {
  it('3MF units · a 1-unit cube in inches · exactly 25.4 mm a side (1 in = 25.4 mm exactly, NIST SP 811 Appendix B)', () => {
    const r = analyseModelFile(cube3mf(1, 'inch'));
    expect(r.format).toBe('3mf');
    expect(r.unitScale).toBe(25.4);
    expect(r.sizeMm).toEqual([25.4, 25.4, 25.4]);
    expect(r.volumeMm3).toBeCloseTo(25.4 ** 3, 9); // a³ (analytic formula)
    expect(r).toMatchObject({ facets: 12, watertight: true, shells: 1, insideOut: false, warnings: [] });
  });

  it('3MF units · millimetres, stated or by default · read as millimetres', () => {
    for (const unit of ['millimeter', null]) {
      const r = analyseModelFile(cube3mf(10, unit));
      expect(r.unitScale).toBe(1);
      expect(r.sizeMm).toEqual([10, 10, 10]);
      expect(r.volumeMm3).toBeCloseTo(1000, 9); // a³ (analytic formula)
      expect(r.areaMm2).toBeCloseTo(600, 9); // 6a² (analytic formula)
    }
  });

  it.each([
    ['micron', 1000, 1], // 1 µm = 0.001 mm (SI prefix)
    ['centimeter', 2, 20], // 1 cm = 10 mm (SI prefix)
    ['foot', 1, 304.8], // 1 ft = 12 in = 304.8 mm exactly (NIST SP 811 Appendix B)
    ['meter', 0.05, 50], // 1 m = 1000 mm (SI prefix)
  ])('%s', (unit, side, mm) => {
    const r = analyseModelFile(cube3mf(side, unit));
    r.sizeMm.forEach((s) => expect(s).toBeCloseTo(mm, 9));
  });

  it('3MF units · drawnInInches on a 3MF · no rescale (its unit is declared)', () => {
    expect(analyseModelFile(cube3mf(10, 'millimeter'), { drawnInInches: true }).sizeMm).toEqual([10, 10, 10]);
  });
});

describe('3MF build items, transforms and components', () => {
  // Transforms are 3×4 row-vector matrices "m00 m01 m02 m10 m11 m12 m20 m21 m22 m30 m31 m32",
  // p' = [x y z 1]·M (3MF Core Specification, 3D matrices — from memory); expectations are worked by hand.

  it('3MF build items · scale 2 and a translation · applied', () => {
    const r = analyseModelFile(cube3mf(10, 'millimeter', '<item objectid="1" transform="2 0 0 0 2 0 0 0 2 10 20 30"/>'));
    expect(r.sizeMm).toEqual([20, 20, 20]);
    expect(r.min).toEqual([10, 20, 30]);
    expect(r.max).toEqual([30, 40, 50]);
    expect(r.volumeMm3).toBeCloseTo(8000, 9); // (2a)³ (analytic formula)
  });

  it('3MF build items · a translated item in inches · the translation scales too', () => {
    const r = analyseModelFile(cube3mf(1, 'inch', '<item objectid="1" transform="1 0 0 0 1 0 0 0 1 2 0 0"/>'));
    expect(r.min[0]).toBeCloseTo(2 * 25.4, 12);
    expect(r.sizeMm[0]).toBeCloseTo(25.4, 12);
  });

  it('3MF build items · component and item transforms · the component transform applies first', () => {
    // The component stretches the cube to 10 × 20 × 30; the item then turns it 90° about z (x' = −y, y' = x).
    const resources = `${cubeObject(1, 10)}<object id="2" type="model"><components><component objectid="1" transform="1 0 0 0 2 0 0 0 3 0 0 0"/></components></object>`;
    const r = analyseModelFile(package3mf(modelXml(resources, '<item objectid="2" transform="0 1 0 -1 0 0 0 0 1 0 0 0"/>')));
    expect(r.sizeMm[0]).toBeCloseTo(20, 12);
    expect(r.sizeMm[1]).toBeCloseTo(10, 12);
    expect(r.sizeMm[2]).toBeCloseTo(30, 12);
    expect(r.volumeMm3).toBeCloseTo(6000, 9); // 10·20·30 (analytic formula)
    expect(r.insideOut).toBe(false);
  });

  it('3MF build items · an object of two placed components · two shells', () => {
    const resources = `${cubeObject(1, 10)}<object id="2"><components><component objectid="1"/><component objectid="1" transform="1 0 0 0 1 0 0 0 1 20 0 0"/></components></object>`;
    const r = analyseModelFile(package3mf(modelXml(resources, '<item objectid="2"/>')));
    expect(r).toMatchObject({ facets: 24, shells: 2, watertight: true, sizeMm: [30, 10, 10] });
    expect(r.volumeMm3).toBeCloseTo(2000, 9);
  });

  it('3MF build items · a mirroring transform · facets keep facing outwards', () => {
    const r = analyseModelFile(cube3mf(10, 'millimeter', '<item objectid="1" transform="-1 0 0 0 1 0 0 0 1 0 0 0"/>'));
    expect(r.min).toEqual([-10, 0, 0]);
    expect(r.insideOut).toBe(false);
    expect(r.signedVolumeMm3).toBeCloseTo(1000, 9);
  });

  it('3MF build items · no build items · every mesh object used once', () => {
    const r = analyseModelFile(package3mf(modelXml(`${cubeObject(1, 10)}${cubeObject(2, 5)}`, '')));
    expect(r.facets).toBe(24);
    expect(r.volumeMm3).toBeCloseTo(1000 + 125, 9);
  });

  it('3MF build items · the same item twice · two copies', () => {
    const r = analyseModelFile(cube3mf(10, 'millimeter', '<item objectid="1"/><item objectid="1" transform="1 0 0 0 1 0 0 0 1 0 0 50"/>'));
    expect(r).toMatchObject({ facets: 24, shells: 2, sizeMm: [10, 10, 60] });
  });

  it('3MF build items · parse3mf · positions in model units with the unit scale', () => {
    const model = parse3mf(cube3mf(1, 'inch'));
    expect(model.unit).toBe('inch');
    expect(model.unitScale).toBe(25.4);
    expect(model.positions.length).toBe(12 * 9);
    expect(Math.max(...model.positions)).toBe(1);
  });
});

describe('3MF package structure', () => {
  it('3MF package · _rels/.rels with entities and %-escapes in the Target · the root model found', () => {
    const bytes = package3mf(modelXml(cubeObject(1, 10), '<item objectid="1"/>'), {
      modelPath: '3D/Rig & Cage.model',
      target: '/3D/Rig%20&amp;%20Cage.model',
    });
    expect(analyseModelFile(bytes).sizeMm).toEqual([10, 10, 10]);
  });

  it('3MF package · no _rels/.rels · falls back to 3D/3dmodel.model', () => {
    expect(analyseModelFile(package3mf(modelXml(cubeObject(1, 10), '<item objectid="1"/>'), { target: null })).facets).toBe(12);
  });

  it('3MF package · a model part named by the production extension path attribute · its objects read', () => {
    const prod = 'http://schemas.microsoft.com/3dmanufacturing/production/2015/06';
    const root = `<?xml version="1.0" encoding="UTF-8"?><model unit="millimeter" xmlns="${CORE}" xmlns:p="${prod}"><resources/><build><item objectid="7" p:path="/3D/Objects/bracket.model"/></build></model>`;
    const part = modelXml(cubeObject(7, 12), '');
    const bytes = package3mf(root, { extra: { '3D/Objects/bracket.model': part } });
    expect(analyseModelFile(bytes).sizeMm).toEqual([12, 12, 12]);
  });

  it('3MF package · comments and extension elements reusing core names · ignored', () => {
    const slice = 'http://schemas.microsoft.com/3dmanufacturing/slice/2015/07';
    const resources = `<!-- <object id="9"><mesh><vertices><vertex x="999" y="0" z="0"/></vertices></mesh></object> -->
      <s:slicestack id="5"><s:slice ztop="1"><s:vertices><s:vertex x="500" y="500"/></s:vertices></s:slice></s:slicestack>
      ${cubeObject(1, 10)}`;
    const model = modelXml(resources, '<item objectid="1"/>', `unit="millimeter" xmlns:s="${slice}"`);
    expect(analyseModelFile(package3mf(model)).sizeMm).toEqual([10, 10, 10]);
  });

  it('3MF package · core elements with a namespace prefix · read', () => {
    const model = `<?xml version="1.0"?><c:model unit="millimeter" xmlns:c="${CORE}"><c:resources><c:object id="1"><c:mesh><c:vertices>
      <c:vertex x="0" y="0" z="0"/><c:vertex x="4" y="0" z="0"/><c:vertex x="0" y="4" z="0"/><c:vertex x="0" y="0" z="4"/></c:vertices>
      <c:triangles><c:triangle v1="0" v2="2" v3="1"/><c:triangle v1="0" v2="1" v3="3"/><c:triangle v1="0" v2="3" v3="2"/><c:triangle v1="1" v2="2" v3="3"/></c:triangles>
      </c:mesh></c:object></c:resources><c:build><c:item objectid="1"/></c:build></c:model>`;
    const r = analyseModelFile(package3mf(model));
    expect(r.volumeMm3).toBeCloseTo(64 / 6, 12); // right tetrahedron with legs 4: a³/6 (analytic formula)
    expect(r).toMatchObject({ watertight: true, insideOut: false });
  });
});

describe('refused 3MF files', () => {
  it('refused 3MF · an entry bigger than the unpacking limit · refused', () => {
    expectFailure(cube3mf(10, 'millimeter'), 'zip_bomb', /would inflate to .* beyond the 0\.0 MB we unpack; the file is refused/, {
      maxUncompressedBytes: 100,
    });
  });

  it('refused 3MF · an entry declaring a huge size (zip bomb) · refused before inflating', () => {
    const bomb = declareSize(cube3mf(10, 'millimeter'), '3D/3dmodel.model', 4_000_000_000);
    expectFailure(bomb, 'zip_bomb', /would inflate to 3814\.7 MB, beyond the 256\.0 MB we unpack/);
  });

  it('refused 3MF · an entry whose declared size is beyond what deflate can reach · refused', () => {
    const bomb = declareSize(cube3mf(10, 'millimeter'), '3D/3dmodel.model', 50_000_000);
    expectFailure(bomb, 'zip_bomb', /claims to inflate [\d,]+ times its stored size, which no real model does/);
  });

  it('refused 3MF · a ZIP with no model part · refused', () => {
    const bytes = zipSync({ 'readme.txt': encode('hello'), 'photos/rig.jpg': new Uint8Array([0xff, 0xd8, 0xff]) });
    expectFailure(bytes, 'no_model', /holds no 3D model part .* found readme\.txt, photos\/rig\.jpg\)\. It is not a 3MF model/);
  });

  it('refused 3MF · not a ZIP at all · refused', () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3]);
    expectFailure(png, 'not_zip', /not a 3MF file: a 3MF is a ZIP archive, but this appears to be a PNG image/, { format: '3mf' });
  });

  it('refused 3MF · a damaged ZIP · refused', () => {
    const bytes = new Uint8Array([0x50, 0x4b, 0x03, 0x04, ...new Array(100).fill(1)]);
    expectFailure(bytes, 'bad_zip', /archive is damaged and cannot be unpacked/);
  });

  it('refused 3MF · a triangle pointing past the vertex list · refused', () => {
    const model = modelXml(cubeObject(1, 10).replace('v3="3"/>', 'v3="8"/>'), '<item objectid="1"/>');
    expectFailure(package3mf(model), 'index_out_of_range', /triangle 1 of object 1 uses vertex 8, but the object has only 8 vertices/);
  });

  it('refused 3MF · a coordinate that is not a number · refused', () => {
    const model = modelXml(cubeObject(1, 10).replace('x="10"', 'x="1,5"'), '<item objectid="1"/>');
    expectFailure(package3mf(model), 'bad_number', /vertex 2 of object 1 has x="1,5", which is not a finite number/);
  });

  it('refused 3MF · a missing coordinate · refused', () => {
    const model = modelXml(cubeObject(1, 10).replace(' z="0"/>', '/>'), '<item objectid="1"/>');
    expectFailure(package3mf(model), 'bad_number', /vertex 1 of object 1 has no z attribute/);
  });

  it('refused 3MF · a negative vertex number · refused', () => {
    const model = modelXml(cubeObject(1, 10).replace('v1="0"', 'v1="-1"'), '<item objectid="1"/>');
    expectFailure(package3mf(model), 'bad_number', /triangle 1 of object 1 has v1="-1", which is not a vertex number/);
  });

  it('refused 3MF · an unknown unit · refused', () => {
    expectFailure(cube3mf(10, 'furlong'), 'bad_unit', /unit="furlong", which is not one of micron, millimeter, centimeter, inch, foot, meter/);
  });

  it('refused 3MF · a malformed transform · refused', () => {
    expectFailure(cube3mf(10, 'millimeter', '<item objectid="1" transform="1 0 0 1"/>'), 'bad_transform', /transform="1 0 0 1", which is not 12 numbers/);
  });

  it('refused 3MF · vertices but no triangles · refused', () => {
    const model = modelXml('<object id="1"><mesh><vertices><vertex x="0" y="0" z="0"/></vertices><triangles/></mesh></object>', '<item objectid="1"/>');
    expectFailure(package3mf(model), 'no_triangles', /no triangles to print/);
  });

  it('refused 3MF · a build item naming an object that does not exist · refused', () => {
    expectFailure(cube3mf(10, 'millimeter', '<item objectid="4"/>'), 'unknown_object', /places object "4", which it never defines/);
  });

  it('refused 3MF · components that contain themselves · refused', () => {
    const resources =
      '<object id="1"><components><component objectid="2"/></components></object><object id="2"><components><component objectid="1"/></components></object>';
    expectFailure(package3mf(modelXml(resources, '<item objectid="1"/>')), 'component_cycle', /contains itself through its components/);
  });

  it('refused 3MF · a model part that is not model XML · refused', () => {
    expectFailure(package3mf('<hello/>'), 'no_model', /is not 3MF model XML/);
  });
});

describe('3MF caps for a printable part (shared/uploads.ts MODEL_LIMITS)', () => {
  it('3MF caps · nested components expanding to 120 million triangles · refused from the object graph, before any geometry is built', () => {
    // 12 × 10^7: a cube placed 10 times in each of 7 nested levels
    expectFailure(nestedComponents3mf(7, 10), 'too_large', /expands to 120,000,000 triangles, more than the 2,500,000 we accept/);
  });

  it('3MF caps · modest nesting (12 × 10³ triangles) · analysed in full', () => {
    expect(analyseModelFile(nestedComponents3mf(3, 10)).facets).toBe(12_000);
  });

  it('3MF caps · components nested 40 deep · refused instead of recursing without bound', () => {
    expectFailure(deeplyNested3mf(40), 'too_deep', /nests components more than 32 deep/);
  });

  it('3MF caps · a model part storing more triangles than the cap · reading stops', () => {
    expectFailure(cube3mf(10, 'millimeter'), 'too_large', /stores more than 10 triangles/, { maxTriangles: 10 });
  });

  it('3MF caps · an entry whose directory understates its size · inflating stops once it outgrows it', () => {
    // 2 MiB of spaces after the model XML compress ~1000:1; the directory then claims only 64 KiB
    const padded = package3mf(modelXml(cubeObject(1, 10), '<item objectid="1"/>') + ' '.repeat(2 * 1024 * 1024));
    expectFailure(declareSize(padded, '3D/3dmodel.model', 64 * 1024), 'zip_bomb', /inflates beyond the 0\.1 MB its directory declares, so its sizes lie/);
  });
});
