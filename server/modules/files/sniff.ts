// Decides what an uploaded file is from its bytes, never from the browser's MIME type or the name.
import { open } from 'node:fs/promises';

export type SniffedType = 'stl' | '3mf' | 'jpeg' | 'png' | 'webp' | 'step' | 'iges' | 'zip' | 'pdf' | 'text' | 'unknown';

export const MIME: Record<SniffedType, string> = {
  stl: 'model/stl',
  '3mf': 'model/3mf',
  jpeg: 'image/jpeg',
  png: 'image/png',
  webp: 'image/webp',
  step: 'model/step',
  iges: 'model/iges',
  zip: 'application/zip',
  pdf: 'application/pdf',
  text: 'text/plain',
  unknown: 'application/octet-stream',
};

export const EXTENSION: Record<SniffedType, string> = {
  stl: '.stl',
  '3mf': '.3mf',
  jpeg: '.jpg',
  png: '.png',
  webp: '.webp',
  step: '.step',
  iges: '.igs',
  zip: '.zip',
  pdf: '.pdf',
  text: '.txt',
  unknown: '.bin',
};

const startsWith = (b: Buffer, bytes: number[], offset = 0) => bytes.every((x, i) => b[offset + i] === x);

function looksLikeText(b: Buffer): boolean {
  if (b.includes(0)) return false;
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(b.subarray(0, Math.max(0, b.length - 4)));
    return true;
  } catch {
    return false;
  }
}

export function sniffBytes(head: Buffer, size: number): SniffedType {
  if (startsWith(head, [0xff, 0xd8, 0xff])) return 'jpeg';
  if (startsWith(head, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'png';
  if (head.subarray(0, 4).toString('latin1') === 'RIFF' && head.subarray(8, 12).toString('latin1') === 'WEBP') return 'webp';
  if (head.subarray(0, 5).toString('latin1') === '%PDF-') return 'pdf';
  if (startsWith(head, [0x50, 0x4b, 0x03, 0x04])) {
    // 3MF is a zip whose package carries a 3D model part; content types come first in practice,
    // but the mesh reader checks the structure properly.
    return /3D\/|\.model|3dmodel/i.test(head.toString('latin1')) ? '3mf' : 'zip';
  }
  if (size >= 84 && 84 + 50 * head.readUInt32LE(80) === size) return 'stl';
  const text = head.toString('latin1').trimStart();
  if (/^ISO-10303-21;/.test(text)) return 'step';
  if (/^solid[\s\S]*facet\s+normal/i.test(text) || /^solid\b/i.test(text)) return 'stl';
  if (head.length >= 80 && /S\s{0,6}1\s*$/m.test(head.subarray(0, 81).toString('latin1')) && head[72] === 0x53) return 'iges';
  if (looksLikeText(head)) return 'text';
  return 'unknown';
}

export async function sniffFile(path: string, size: number): Promise<SniffedType> {
  const handle = await open(path, 'r');
  try {
    const head = Buffer.alloc(Math.min(4096, size));
    await handle.read(head, 0, head.length, 0);
    return sniffBytes(head, size);
  } finally {
    await handle.close();
  }
}

// Bidirectional formatting characters reorder what is shown: "invoice\u202Etxt.exe" reads as
// "invoiceexe.txt". Unicode 15 UAX #9 §2 lists them (embeddings, overrides, isolates, marks).
const BIDI_CONTROLS = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

/** A plain name to show beside a file: no folders, no control or bidi characters, no markup. */
export function displayName(original: string): string {
  const base = original.split(/[\\/]/).pop() ?? '';
  const clean = base
    .normalize('NFC')
    .replace(/[\u0000-\u001f\u007f<>:"|?*]/g, '')
    .replace(BIDI_CONTROLS, '')
    .replace(/^\.+/, '')
    .trim()
    .slice(0, 200);
  return clean || 'file';
}

const MODEL_EXTENSIONS = ['.stl', '.3mf'];

/**
 * The name a model is saved under when downloaded: whatever it was uploaded as, it ends in the
 * extension of what the bytes are (".stl" or ".3mf"), so nobody saves a mesh as "….exe".
 */
export function modelFileName(name: string, extension: string): string {
  const lower = name.toLowerCase();
  if (lower.endsWith(extension)) return name;
  const other = MODEL_EXTENSIONS.find((e) => lower.endsWith(e));
  const stem = other ? name.slice(0, -other.length) : name;
  return `${stem.slice(0, 200 - extension.length)}${extension}`;
}
