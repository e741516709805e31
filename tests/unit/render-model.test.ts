import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { Vector3 } from 'three';
import type { PartFile } from '../../server/db/models';
import { MAX_RENDER_ATTEMPTS, RenderJobs } from '../../server/modules/files/render-jobs';
import { createLocalStorage } from '../../server/modules/files/storage-local';
import { keysOf } from '../../server/modules/files/stored-files';
import { downsample, rasterise, RENDER_COLOURS, viewBasis } from '../../server/modules/files/render-model';
import { boxStl } from '../helpers/meshes';
import { parseStl } from '../../shared/mesh/stl';

const root = mkdtempSync(join(tmpdir(), 'rigshelf-render-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const pixel = (r: { width: number; data: Uint8Array }, x: number, y: number) => {
  const i = (y * r.width + x) * 4;
  return [r.data[i], r.data[i + 1], r.data[i + 2]];
};

describe('model picture · view', () => {
  it('model picture view · the camera · 45° round to the right and 30° up: direction to the viewer (sin45·cos30, −cos45·cos30, sin30)', () => {
    // spherical to cartesian coordinates (any analytic geometry handbook), front = −Y, Z up
    const { toViewer, right, up } = viewBasis();
    expect(toViewer.x).toBeCloseTo(Math.SQRT1_2 * Math.cos(Math.PI / 6), 12);
    expect(toViewer.y).toBeCloseTo(-Math.SQRT1_2 * Math.cos(Math.PI / 6), 12);
    expect(toViewer.z).toBeCloseTo(0.5, 12);
    // an orthonormal, right-handed frame with vertical lines upright on screen
    expect(right.dot(up)).toBeCloseTo(0, 12);
    expect(right.z).toBeCloseTo(0, 12);
    expect(new Vector3().crossVectors(right, up).distanceTo(toViewer)).toBeCloseTo(0, 12);
  });

  it('model picture view · the isometric elevation (arctan 1/√2 ≈ 35.26°) · the three axes foreshortened alike, to √(2/3) ≈ 0.8165', () => {
    // isometric projection: every axis scaled by √(2/3) (descriptive geometry, "isometric projection")
    const { right, up } = viewBasis({ azimuthDeg: 45, elevationDeg: (Math.atan(1 / Math.SQRT2) * 180) / Math.PI });
    for (const axis of [new Vector3(1, 0, 0), new Vector3(0, 1, 0), new Vector3(0, 0, 1)]) {
      expect(Math.hypot(axis.dot(right), axis.dot(up))).toBeCloseTo(Math.sqrt(2 / 3), 12);
    }
  });
});

describe('model picture · pixels', () => {
  const cube = parseStl(boxStl(20, 20, 20)).positions;
  const picture = rasterise(cube, 400, 300);

  it('model picture pixels · backdrop corners and size · the palette colours; the size asked for', () => {
    expect(picture.data.length).toBe(400 * 300 * 4);
    expect(pixel(picture, 0, 0)).toEqual([...RENDER_COLOURS.backdropTop]);
    expect(pixel(picture, 399, 299)).toEqual([...RENDER_COLOURS.backdropBottom]);
  });

  it('model picture pixels · a cube with flat shading · top lit more than front; every face the part colour scaled', () => {
    // the cube is fitted into the left 68 % of the picture; its top face is above the middle, the
    // front (−Y) face below and left of it, the right (+X) face below and right
    const { toViewer } = viewBasis();
    expect(toViewer.z).toBeGreaterThan(0);
    const cx = Math.round(0.03 * 400 + (0.68 * 400) / 2);
    const top = pixel(picture, cx, 100);
    const front = pixel(picture, cx - 40, 190);
    const side = pixel(picture, cx + 40, 190);
    const ratio = (p: number[]) => p[1] / RENDER_COLOURS.part[1];
    expect(ratio(top)).toBeGreaterThan(ratio(front));
    expect(ratio(top)).toBeGreaterThan(ratio(side));
    for (const p of [top, front, side]) {
      // the hue stays the part's: channel ratios within rounding of the palette's
      expect(p[0] / p[1]).toBeCloseTo(RENDER_COLOURS.part[0] / RENDER_COLOURS.part[1], 1);
    }
  });

  it('model picture pixels · the same model twice · the same pixels', () => {
    expect(Buffer.from(rasterise(cube, 400, 300).data).equals(Buffer.from(picture.data))).toBe(true);
  });

  it('model picture pixels · downsampling · averages each block of pixels', () => {
    const big = { width: 2, height: 2, data: Uint8Array.from([0, 0, 0, 255, 100, 100, 100, 255, 200, 200, 200, 255, 100, 100, 100, 255]) };
    expect([...downsample(big, 2).data]).toEqual([100, 100, 100, 255]);
  });
});

// worker threads start and die here: generous on a loaded machine
describe('model picture · jobs', { timeout: 60_000 }, () => {
  const tasks = new URL('../helpers/render-tasks.ts', import.meta.url).href;

  function fakeRow(renderAttempts = 0) {
    const row = {
      storedName: 'x.stl',
      analysis: null,
      renderStatus: 'pending' as 'pending' | 'ready' | 'failed',
      renderAttempts,
      async update(values: Partial<{ renderStatus: 'ready' | 'failed'; renderAttempts: number }>) {
        Object.assign(row, values);
      },
    };
    return row;
  }

  const storage = createLocalStorage(join(root, 'uploads'));
  const store = join(root, 'uploads', 'store');

  async function run(source: string, row: ReturnType<typeof fakeRow>) {
    const jobs = new RenderJobs({ tasks, timeoutMs: 20_000, storage });
    writeFileSync(join(store, source), 'solid x');
    const paths = { source: join(store, source), display: join(store, `${source}-display.jpg`), thumbnail: join(store, `${source}-thumb.jpg`) };
    jobs.render(row as unknown as PartFile, keysOf({ kind: 'model', storedName: source }), async () => row as unknown as PartFile);
    await jobs.settled();
    await jobs.close();
    return paths;
  }

  it(`model picture jobs · a picture that times out · tried ${MAX_RENDER_ATTEMPTS} times, then failed with nothing left on disk`, async () => {
    const row = fakeRow();
    const paths = await run('slow.stl', row);
    expect(row).toMatchObject({ renderStatus: 'failed', renderAttempts: MAX_RENDER_ATTEMPTS });
    expect(existsSync(paths.display) || existsSync(paths.thumbnail)).toBe(false);
  });

  it('model picture jobs · a model the drawing refuses · failed at the first try, half-written pictures removed', async () => {
    const row = fakeRow();
    const paths = await run('permanent.stl', row);
    expect(row).toMatchObject({ renderStatus: 'failed', renderAttempts: 1 });
    expect(existsSync(paths.display)).toBe(false);
  });

  it('model picture jobs · a thread dying under a model · counts as a try; a model with two tries is not drawn again', async () => {
    const row = fakeRow();
    await run('crash.stl', row);
    expect(row).toMatchObject({ renderStatus: 'failed', renderAttempts: 2 });
    const spent = fakeRow(MAX_RENDER_ATTEMPTS);
    writeFileSync(join(store, 'spent.stl-display.jpg'), 'old');
    await run('spent.stl', spent);
    expect(spent).toMatchObject({ renderStatus: 'failed', renderAttempts: MAX_RENDER_ATTEMPTS });
    expect(existsSync(join(store, 'spent.stl-display.jpg'))).toBe(false);
  });
});
