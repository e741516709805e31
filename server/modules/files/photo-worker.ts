// Runs in the worker pool (see worker-tasks.ts): checks and decodes photos, turns them upright from
// their EXIF orientation, and writes re-encoded display and thumbnail JPEGs. Re-encoding drops all
// metadata (EXIF, GPS, XMP). Relative imports only: this module is loaded inside worker threads.
import { readFile, writeFile } from 'node:fs/promises';
import { createJimp } from '@jimp/core';
import webp from '@jimp/wasm-webp';
import { imageSize } from 'image-size';
import { defaultFormats, defaultPlugins } from 'jimp';
import { PHOTO_MAX_PIXELS } from '../../../shared/uploads';

export interface PhotoJob {
  source: string;
  display: string;
  thumbnail: string;
}

/**
 * `permanent`: the photo itself is at fault, so trying again would fail again. `interrupted`: the
 * queue closed (shutdown) first; the photo stays waiting for the next start.
 */
export type PhotoResult = { ok: true; width: number; height: number } | { ok: false; error: string; permanent: boolean; interrupted?: boolean };

export type PhotoCheck = { ok: true; width: number; height: number } | { ok: false; reason: string };

const Jimp = createJimp({ formats: [...defaultFormats, webp], plugins: defaultPlugins });

export const DISPLAY_MAX = 1600;
export const THUMB_MAX = 480;

class PhotoRefused extends Error {}

/** Width and height as the header declares them, refused above the pixel limit before any decoding. */
export function declaredSize(bytes: Uint8Array): { width: number; height: number } {
  let size: { width?: number; height?: number };
  try {
    size = imageSize(bytes);
  } catch {
    throw new PhotoRefused('its header is damaged, so it cannot be read');
  }
  const { width, height } = size;
  if (!width || !height) throw new PhotoRefused('its header declares no size, so it cannot be read');
  if (width * height > PHOTO_MAX_PIXELS) {
    throw new PhotoRefused(
      `it declares ${width} × ${height} pixels (${((width * height) / 1e6).toFixed(1)} megapixels); photos may have at most ${PHOTO_MAX_PIXELS / 1e6} megapixels. Scale it down and upload it again`,
    );
  }
  return { width, height };
}

const isJpeg = (b: Uint8Array) => b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff;
const isRst = (marker: number) => marker >= 0xd0 && marker <= 0xd7;

/**
 * Walks a JPEG's segments and entropy-coded data (ITU-T T.81 Annex B) to its end-of-image marker.
 * The decoder forgives a file that stops early and paints the rest grey; this does not.
 */
export function jpegReachesEnd(b: Uint8Array): boolean {
  let i = 2;
  while (i + 1 < b.length) {
    if (b[i] !== 0xff) return false;
    const marker = b[i + 1];
    if (marker === 0xff) {
      i += 1; // fill byte
      continue;
    }
    if (marker === 0xd9) return true;
    if (isRst(marker) || marker === 0x01) {
      i += 2;
      continue;
    }
    if (i + 3 >= b.length) return false;
    const length = (b[i + 2] << 8) | b[i + 3];
    if (length < 2) return false;
    i += 2 + length;
    if (marker === 0xda) {
      // scan data: 0xFF is followed by a stuffed 0x00, a restart marker or fill until the next marker
      while (i + 1 < b.length && !(b[i] === 0xff && b[i + 1] !== 0x00 && !isRst(b[i + 1]) && b[i + 1] !== 0xff)) i += 1;
    }
  }
  return false;
}

async function decode(bytes: Buffer) {
  declaredSize(bytes);
  if (isJpeg(bytes) && !jpegReachesEnd(bytes)) throw new PhotoRefused('the JPEG stops before its end, so the upload or the export was cut off');
  try {
    return await Jimp.read(bytes);
  } catch (err) {
    throw new PhotoRefused(`it cannot be decoded (${(err as Error).message || 'damaged image data'})`);
  }
}

/** The upload check: does the photo decode completely, within the pixel limit? */
export async function verifyPhoto({ path }: { path: string }): Promise<PhotoCheck> {
  try {
    const image = await decode(await readFile(path));
    return { ok: true, width: image.bitmap.width, height: image.bitmap.height };
  } catch (err) {
    if (err instanceof PhotoRefused) return { ok: false, reason: err.message };
    throw err;
  }
}

/** Cleans one photo: upright, metadata dropped, display and thumbnail sizes written. */
export async function processPhoto(job: PhotoJob): Promise<PhotoResult> {
  try {
    const image = await decode(await readFile(job.source));
    const { width, height } = image.bitmap;
    const scaleTo = (max: number) => {
      const copy = image.clone();
      if (Math.max(width, height) > max) copy.scaleToFit({ w: max, h: max });
      return copy.getBuffer('image/jpeg', { quality: 85 });
    };
    await writeFile(job.display, await scaleTo(DISPLAY_MAX));
    await writeFile(job.thumbnail, await scaleTo(THUMB_MAX));
    return { ok: true, width, height };
  } catch (err) {
    return { ok: false, error: (err as Error).message, permanent: err instanceof PhotoRefused };
  }
}
