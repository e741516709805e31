import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { analyseModelFile, MeshError } from '@shared/mesh';
import { analyseModelPath } from '../../server/modules/files/analyse-model';

// The server's path streams a large binary STL from disk; it must give exactly what analysing the
// whole file in memory gives.

const dir = mkdtempSync(join(tmpdir(), 'analyse-model-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A closed torus of u × v quads as binary STL (2·u·v facets), 160 mm across times `scale`. */
function torusStl(u: number, v: number, scale = 1): Uint8Array {
  const facets = 2 * u * v;
  const bytes = new Uint8Array(84 + 50 * facets);
  const view = new DataView(bytes.buffer);
  view.setUint32(80, facets, true);
  const p = (i: number, j: number) => {
    const t = (2 * Math.PI * (i % u)) / u,
      f = (2 * Math.PI * (j % v)) / v;
    return [(60 + 20 * Math.cos(f)) * Math.cos(t) * scale, (60 + 20 * Math.cos(f)) * Math.sin(t) * scale, 20 * Math.sin(f) * scale];
  };
  let o = 84;
  const put = (...corners: number[][]) => {
    o += 12;
    for (const c of corners) for (const x of c) view.setFloat32((o += 4) - 4, x, true);
    o += 2;
  };
  for (let i = 0; i < u; i++) {
    for (let j = 0; j < v; j++) {
      put(p(i, j), p(i + 1, j), p(i + 1, j + 1));
      put(p(i, j), p(i + 1, j + 1), p(i, j + 1));
    }
  }
  return bytes;
}

describe('analyseModelPath', () => {
  it('analyseModelPath · a 6 MB binary STL streamed from disk · the same figures as the whole file in memory', async () => {
    const bytes = torusStl(300, 200); // 120,000 facets, 6,000,084 bytes: over the 4 MiB streaming threshold
    const file = join(dir, 'torus.stl');
    writeFileSync(file, bytes);
    const streamed = await analyseModelPath(file);
    expect(streamed).toEqual(analyseModelFile(bytes));
    expect(streamed).toMatchObject({ facets: 120_000, watertight: true, format: 'stl-binary', shells: 1 });
  });

  it('analyseModelPath · drawn in inches · scaled by 25.4 like the in-memory path', async () => {
    const bytes = torusStl(300, 200, 1 / 25.4); // 160 mm once read as inches
    const file = join(dir, 'inches.stl');
    writeFileSync(file, bytes);
    expect(await analyseModelPath(file, { drawnInInches: true })).toEqual(analyseModelFile(bytes, { drawnInInches: true }));
  });

  it('analyseModelPath · a streamed STL over 2 m once read as inches · the same implausible_size refusal as in memory', async () => {
    const bytes = torusStl(300, 200);
    const file = join(dir, 'too-large.stl');
    writeFileSync(file, bytes);
    await expect(analyseModelPath(file, { drawnInInches: true })).rejects.toMatchObject({ code: 'implausible_size' });
    expect(() => analyseModelFile(bytes, { drawnInInches: true })).toThrow(MeshError);
  });

  it('analyseModelPath · a small or broken file · the in-memory path and its MeshError', async () => {
    const file = join(dir, 'broken.stl');
    writeFileSync(file, new Uint8Array(200));
    await expect(analyseModelPath(file)).rejects.toBeInstanceOf(MeshError);
  });
});
