// Runs in the worker pool (see worker-tasks.ts): draws a shaded preview of a model for parts without a
// photo. A fixed three-quarter view (orthographic, from the front right and above), flat shading from
// each facet's own normal, a z-buffer rasteriser, Rigshelf's colours, and the measured size printed
// beside the part. The view is built with three.js's math; the pixels are ours, the text and the JPEG
// are jimp's. The same model always gives the same pixels. Relative imports only: worker-side module.
import { readFile, writeFile } from 'node:fs/promises';
import { Jimp, loadFont } from 'jimp';
import { SANS_16_BLACK, SANS_32_BLACK } from 'jimp/fonts';
import { Matrix4, Vector3 } from 'three';
import { MM_PER_INCH } from '../../../shared/mesh/analysis';
import { parseStl } from '../../../shared/mesh/stl';
import { isZip, parse3mf } from '../../../shared/mesh/threemf';

export const RENDER_DISPLAY = { width: 1200, height: 900 } as const;
export const RENDER_THUMB = { width: 480, height: 360 } as const;
/** Drawn at twice the display size and scaled down, so edges are smooth. */
const SUPERSAMPLE = 2;
/** The part is fitted into the left of the picture; the size is printed in the column on the right. */
const MODEL_AREA = { x: 0.03, y: 0.06, width: 0.68, height: 0.88 } as const;

/** Colours (RGB) from the Rigshelf palette (src/theme/preset.ts): slate backdrop, cyc-green part. */
export const RENDER_COLOURS = {
  backdropTop: [0xf5, 0xf7, 0xf7],
  backdropBottom: [0xd3, 0xda, 0xda],
  part: [0x5c, 0xb0, 0xa0],
  outline: [0x16, 0x37, 0x33],
} as const;

/** Three-quarter view: 45° round from the front towards the right, 30° above the bed (Z up, as STL and 3MF draw). */
export const VIEW = { azimuthDeg: 45, elevationDeg: 30 } as const;
/** Two lights in view space terms of the world: a key light from the upper left front and a dim fill from the right. */
const KEY_LIGHT = new Vector3(-0.3, -0.35, 0.89).normalize();
const FILL_LIGHT = new Vector3(0.8, -0.2, 0.15).normalize();
const AMBIENT = 0.38;
const KEY = 0.56;
const FILL = 0.2;

export interface RenderJob {
  source: string;
  display: string;
  thumbnail: string;
  /** The measured size (x, y, z) in mm, printed beside the part; null leaves the column empty. */
  sizeMm: [number, number, number] | null;
  drawnInInches?: boolean;
}

export type RenderResult = { ok: true; width: number; height: number } | { ok: false; error: string; permanent: boolean; interrupted?: boolean };

class RenderRefused extends Error {}

/** The unit vectors of the camera: right, up (on screen) and towards the viewer, in world coordinates. */
export function viewBasis(view: { azimuthDeg: number; elevationDeg: number } = VIEW): { right: Vector3; up: Vector3; toViewer: Vector3 } {
  const az = (view.azimuthDeg * Math.PI) / 180;
  const el = (view.elevationDeg * Math.PI) / 180;
  // the front of a part faces -Y; turning the eye by the azimuth brings it round to the right (+X)
  const eye = new Vector3(Math.sin(az) * Math.cos(el), -Math.cos(az) * Math.cos(el), Math.sin(el));
  const m = new Matrix4().lookAt(eye, new Vector3(0, 0, 0), new Vector3(0, 0, 1));
  const right = new Vector3();
  const up = new Vector3();
  const toViewer = new Vector3();
  m.extractBasis(right, up, toViewer);
  return { right, up, toViewer };
}

export interface Raster {
  width: number;
  height: number;
  /** RGBA, row by row. */
  data: Uint8Array;
}

/**
 * Rasterises the triangles (9 numbers each) into an RGBA picture of the given size, the part fitted
 * into `area` (fractions of the picture). Pure: no files, no clock, no randomness.
 */
export function rasterise(
  positions: ArrayLike<number>,
  width: number,
  height: number,
  area: { x: number; y: number; width: number; height: number } = MODEL_AREA,
): Raster {
  const { right, up, toViewer } = viewBasis();
  const n = Math.floor(positions.length / 9);
  // view coordinates of every vertex: sx to the right, sy up the screen, sz towards the viewer
  const view = new Float64Array(n * 9);
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  let minZ = Infinity;
  let maxZ = -Infinity;
  for (let v = 0; v < n * 3; v++) {
    const x = positions[v * 3];
    const y = positions[v * 3 + 1];
    const z = positions[v * 3 + 2];
    if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) continue;
    const sx = x * right.x + y * right.y + z * right.z;
    const sy = x * up.x + y * up.y + z * up.z;
    const sz = x * toViewer.x + y * toViewer.y + z * toViewer.z;
    view[v * 3] = sx;
    view[v * 3 + 1] = sy;
    view[v * 3 + 2] = sz;
    if (sx < minX) minX = sx;
    if (sx > maxX) maxX = sx;
    if (sy < minY) minY = sy;
    if (sy > maxY) maxY = sy;
    if (sz < minZ) minZ = sz;
    if (sz > maxZ) maxZ = sz;
  }
  const data = new Uint8Array(width * height * 4);
  // the backdrop: a soft vertical fade
  const [t, b] = [RENDER_COLOURS.backdropTop, RENDER_COLOURS.backdropBottom];
  for (let py = 0; py < height; py++) {
    const f = py / (height - 1);
    const r = Math.round(t[0] + (b[0] - t[0]) * f);
    const g = Math.round(t[1] + (b[1] - t[1]) * f);
    const bl = Math.round(t[2] + (b[2] - t[2]) * f);
    for (let px = 0; px < width; px++) {
      const i = (py * width + px) * 4;
      data[i] = r;
      data[i + 1] = g;
      data[i + 2] = bl;
      data[i + 3] = 255;
    }
  }
  if (!(maxX > minX) && !(maxY > minY)) return { width, height, data };

  const areaW = area.width * width;
  const areaH = area.height * height;
  const scale = Math.min(areaW / Math.max(maxX - minX, 1e-9), areaH / Math.max(maxY - minY, 1e-9));
  const offX = area.x * width + (areaW - (maxX - minX) * scale) / 2;
  const offY = area.y * height + (areaH - (maxY - minY) * scale) / 2;
  const toPx = (sx: number) => offX + (sx - minX) * scale;
  const toPy = (sy: number) => offY + (maxY - sy) * scale;

  const depth = new Float32Array(width * height).fill(-Infinity);
  const shade = new Float32Array(width * height).fill(-1);
  const [pr, pg, pb] = RENDER_COLOURS.part;
  for (let f = 0; f < n; f++) {
    const o = f * 9;
    // the facet's normal from its corners (world space), two-sided so reversed facets still show
    const ax = positions[o + 3] - positions[o];
    const ay = positions[o + 4] - positions[o + 1];
    const az = positions[o + 5] - positions[o + 2];
    const bx = positions[o + 6] - positions[o];
    const by = positions[o + 7] - positions[o + 1];
    const bz = positions[o + 8] - positions[o + 2];
    let nx = ay * bz - az * by;
    let ny = az * bx - ax * bz;
    let nz = ax * by - ay * bx;
    const len = Math.hypot(nx, ny, nz);
    if (!(len > 0) || !Number.isFinite(len)) continue;
    nx /= len;
    ny /= len;
    nz /= len;
    if (nx * toViewer.x + ny * toViewer.y + nz * toViewer.z < 0) {
      nx = -nx;
      ny = -ny;
      nz = -nz;
    }
    const light =
      AMBIENT +
      KEY * Math.max(0, nx * KEY_LIGHT.x + ny * KEY_LIGHT.y + nz * KEY_LIGHT.z) +
      FILL * Math.max(0, nx * FILL_LIGHT.x + ny * FILL_LIGHT.y + nz * FILL_LIGHT.z);

    const x0 = toPx(view[o]);
    const y0 = toPy(view[o + 1]);
    const z0 = view[o + 2];
    const x1 = toPx(view[o + 3]);
    const y1 = toPy(view[o + 4]);
    const z1 = view[o + 5];
    const x2 = toPx(view[o + 6]);
    const y2 = toPy(view[o + 7]);
    const z2 = view[o + 8];
    const areaTwice = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    if (areaTwice === 0 || !Number.isFinite(areaTwice)) continue;
    const left = Math.max(0, Math.floor(Math.min(x0, x1, x2)));
    const rightPx = Math.min(width - 1, Math.ceil(Math.max(x0, x1, x2)));
    const top = Math.max(0, Math.floor(Math.min(y0, y1, y2)));
    const bottom = Math.min(height - 1, Math.ceil(Math.max(y0, y1, y2)));
    const inv = 1 / areaTwice;
    for (let py = top; py <= bottom; py++) {
      const cy = py + 0.5;
      for (let px = left; px <= rightPx; px++) {
        const cx = px + 0.5;
        // barycentric weights of the pixel centre; inside when all three have the triangle's sign
        const w0 = ((x1 - cx) * (y2 - cy) - (x2 - cx) * (y1 - cy)) * inv;
        const w1 = ((x2 - cx) * (y0 - cy) - (x0 - cx) * (y2 - cy)) * inv;
        const w2 = 1 - w0 - w1;
        if (w0 < 0 || w1 < 0 || w2 < 0) continue;
        const z = w0 * z0 + w1 * z1 + w2 * z2;
        const i = py * width + px;
        if (z <= depth[i]) continue;
        depth[i] = z;
        shade[i] = light;
      }
    }
  }

  // an outline where the depth jumps (silhouette and steps), so small parts read at thumbnail size
  const jump = Math.max(maxZ - minZ, 1e-9) * 0.04;
  const [or, og, ob] = RENDER_COLOURS.outline;
  for (let py = 0; py < height; py++) {
    for (let px = 0; px < width; px++) {
      const i = py * width + px;
      if (shade[i] < 0) continue;
      const d = depth[i] - jump;
      const edge =
        (px + 1 < width && (shade[i + 1] < 0 || depth[i + 1] < d)) ||
        (px > 0 && (shade[i - 1] < 0 || depth[i - 1] < d)) ||
        (py + 1 < height && (shade[i + width] < 0 || depth[i + width] < d)) ||
        (py > 0 && (shade[i - width] < 0 || depth[i - width] < d));
      const k = i * 4;
      if (edge) {
        data[k] = or;
        data[k + 1] = og;
        data[k + 2] = ob;
      } else {
        const s = Math.min(1.15, shade[i]);
        data[k] = Math.min(255, Math.round(pr * s));
        data[k + 1] = Math.min(255, Math.round(pg * s));
        data[k + 2] = Math.min(255, Math.round(pb * s));
      }
    }
  }
  return { width, height, data };
}

/** Averages each `factor` × `factor` block of pixels into one (a box filter). */
export function downsample(big: Raster, factor: number): Raster {
  const width = Math.floor(big.width / factor);
  const height = Math.floor(big.height / factor);
  const data = new Uint8Array(width * height * 4);
  const cells = factor * factor;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      for (let c = 0; c < 4; c++) {
        let sum = 0;
        for (let dy = 0; dy < factor; dy++) {
          const row = ((y * factor + dy) * big.width + x * factor) * 4 + c;
          for (let dx = 0; dx < factor; dx++) sum += big.data[row + dx * 4];
        }
        data[(y * width + x) * 4 + c] = Math.round(sum / cells);
      }
    }
  }
  return { width, height, data };
}

/** The facets of a stored STL or 3MF, 9 numbers each (the unit does not matter to a picture). */
export function modelPositions(bytes: Uint8Array): ArrayLike<number> {
  const positions = isZip(bytes) ? parse3mf(bytes).positions : parseStl(bytes).positions;
  if (positions.length < 9) throw new RenderRefused('the model holds no facets');
  return positions;
}

function sizeLines(sizeMm: [number, number, number]) {
  const mm = (v: number) => `${Number(v.toFixed(Math.abs(v) < 1 && v !== 0 ? 2 : 1))} mm`;
  const inches = sizeMm.map((v) => (v / MM_PER_INCH).toFixed(2)).join(' × ');
  return {
    lines: [`W ${mm(sizeMm[0])}`, `D ${mm(sizeMm[1])}`, `H ${mm(sizeMm[2])}`],
    inches: `${inches} in`,
  };
}

// read once per worker thread
let fonts: Promise<[Awaited<ReturnType<typeof loadFont>>, Awaited<ReturnType<typeof loadFont>>]> | undefined;

/** The picture as a jimp image at display size: the part, and its measured size in the right column. */
export async function renderPicture(positions: ArrayLike<number>, sizeMm: [number, number, number] | null) {
  const small = downsample(rasterise(positions, RENDER_DISPLAY.width * SUPERSAMPLE, RENDER_DISPLAY.height * SUPERSAMPLE), SUPERSAMPLE);
  const image = new Jimp({ width: small.width, height: small.height });
  image.bitmap.data = Buffer.from(small.data.buffer, small.data.byteOffset, small.data.byteLength);
  if (sizeMm) {
    fonts ??= Promise.all([loadFont(SANS_32_BLACK), loadFont(SANS_16_BLACK)]).catch((err) => {
      fonts = undefined;
      throw err;
    });
    const [large, small] = await fonts;
    const { lines, inches } = sizeLines(sizeMm);
    const x = Math.round(RENDER_DISPLAY.width * 0.74);
    let y = Math.round(RENDER_DISPLAY.height * 0.36);
    image.print({ font: small, x, y, text: 'MEASURED SIZE' });
    y += 30;
    for (const line of lines) {
      image.print({ font: large, x, y, text: line });
      y += 44;
    }
    image.print({ font: small, x, y: y + 4, text: inches });
    // a rule beside the figures, in the outline colour
    const [r, g, b] = RENDER_COLOURS.outline;
    const colour = ((r << 24) | (g << 16) | (b << 8) | 0xff) >>> 0;
    for (let ry = Math.round(RENDER_DISPLAY.height * 0.36); ry < y + 24; ry++) {
      for (let rx = x - 18; rx < x - 14; rx++) image.setPixelColor(colour, rx, ry);
    }
  }
  return image;
}

/** The pool task: reads the model, writes the display and thumbnail JPEGs. */
export async function renderModel(job: RenderJob): Promise<RenderResult> {
  let positions: ArrayLike<number>;
  try {
    positions = modelPositions(await readFile(job.source));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return { ok: false, error: 'the model file is gone', permanent: true };
    return { ok: false, error: `the model cannot be read for a picture (${(err as Error).message})`, permanent: true };
  }
  try {
    const image = await renderPicture(positions, job.sizeMm);
    await writeFile(job.display, await image.getBuffer('image/jpeg', { quality: 88 }));
    image.resize({ w: RENDER_THUMB.width, h: RENDER_THUMB.height });
    await writeFile(job.thumbnail, await image.getBuffer('image/jpeg', { quality: 85 }));
    return { ok: true, width: RENDER_DISPLAY.width, height: RENDER_DISPLAY.height };
  } catch (err) {
    return { ok: false, error: (err as Error).message, permanent: err instanceof RenderRefused };
  }
}
