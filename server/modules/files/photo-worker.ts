// Runs in a worker thread: decodes a photo, turns it upright from its EXIF orientation, and writes
// re-encoded display and thumbnail JPEGs. Re-encoding drops all metadata (EXIF, GPS, XMP).
import { parentPort } from 'node:worker_threads';
import { readFile, writeFile } from 'node:fs/promises';
import { createJimp } from '@jimp/core';
import webp from '@jimp/wasm-webp';
import { defaultFormats, defaultPlugins } from 'jimp';

export interface PhotoJob {
  id: number;
  source: string;
  display: string;
  thumbnail: string;
}

export type PhotoResult = { id: number; ok: true; width: number; height: number } | { id: number; ok: false; error: string };

const Jimp = createJimp({ formats: [...defaultFormats, webp], plugins: defaultPlugins });

export const DISPLAY_MAX = 1600;
export const THUMB_MAX = 480;

async function processPhoto(job: PhotoJob): Promise<PhotoResult> {
  const image = await Jimp.read(await readFile(job.source));
  const { width, height } = image.bitmap;
  const scaleTo = (max: number) => {
    const copy = image.clone();
    if (Math.max(width, height) > max) {
      copy.scaleToFit({ w: max, h: max });
    }
    return copy.getBuffer('image/jpeg', { quality: 85 });
  };
  await writeFile(job.display, await scaleTo(DISPLAY_MAX));
  await writeFile(job.thumbnail, await scaleTo(THUMB_MAX));
  return { id: job.id, ok: true, width, height };
}

parentPort?.on('message', (job: PhotoJob) => {
  processPhoto(job)
    .then((result) => parentPort!.postMessage(result))
    .catch((err: Error) => parentPort!.postMessage({ id: job.id, ok: false, error: err.message } satisfies PhotoResult));
});
