// A real JPEG (encoded by jimp) with an EXIF block spliced in by hand: an orientation tag and GPS
// coordinates, as a phone would write them (TIFF 6.0 / Exif 2.3 tag layout).
import { crc32, deflateSync } from 'node:zlib';
import { Jimp } from 'jimp';

function exifSegment(orientation: number): Buffer {
  // little-endian TIFF: header, IFD0 (Orientation, GPS pointer), GPS IFD (lat ref + lat)
  const tiff = Buffer.alloc(8 + 2 + 2 * 12 + 4 + 2 + 2 * 12 + 4 + 24);
  let o = 0;
  tiff.write('II', o);
  o += 2;
  tiff.writeUInt16LE(42, o);
  o += 2;
  tiff.writeUInt32LE(8, o);
  o += 4;
  const gpsIfd = 8 + 2 + 2 * 12 + 4;
  tiff.writeUInt16LE(2, o);
  o += 2;
  tiff.writeUInt16LE(0x0112, o);
  tiff.writeUInt16LE(3, o + 2);
  tiff.writeUInt32LE(1, o + 4);
  tiff.writeUInt16LE(orientation, o + 8);
  o += 12;
  tiff.writeUInt16LE(0x8825, o);
  tiff.writeUInt16LE(4, o + 2);
  tiff.writeUInt32LE(1, o + 4);
  tiff.writeUInt32LE(gpsIfd, o + 8);
  o += 12;
  tiff.writeUInt32LE(0, o);
  o += 4;
  const rationals = gpsIfd + 2 + 2 * 12 + 4;
  tiff.writeUInt16LE(2, o);
  o += 2;
  tiff.writeUInt16LE(0x0001, o);
  tiff.writeUInt16LE(2, o + 2);
  tiff.writeUInt32LE(2, o + 4);
  tiff.write('N\0', o + 8, 'latin1');
  o += 12;
  tiff.writeUInt16LE(0x0002, o);
  tiff.writeUInt16LE(5, o + 2);
  tiff.writeUInt32LE(3, o + 4);
  tiff.writeUInt32LE(rationals, o + 8);
  o += 12;
  tiff.writeUInt32LE(0, o);
  o += 4;
  for (const [num, den] of [
    [51, 1],
    [30, 1],
    [1234, 100],
  ]) {
    tiff.writeUInt32LE(num, o);
    tiff.writeUInt32LE(den, o + 4);
    o += 8;
  }
  const body = Buffer.concat([Buffer.from('Exif\0\0', 'latin1'), tiff]);
  const header = Buffer.from([0xff, 0xe1, 0, 0]);
  header.writeUInt16BE(body.length + 2, 2);
  return Buffer.concat([header, body]);
}

/** A width×height JPEG whose EXIF says "rotate 90° clockwise" (6) and carries GPS latitude 51°30'12.34" N. */
export async function jpegWithGps(width = 64, height = 48, orientation = 6): Promise<Buffer> {
  const jpeg = await new Jimp({ width, height, color: 0x2f7c6fff }).getBuffer('image/jpeg');
  return Buffer.concat([jpeg.subarray(0, 2), exifSegment(orientation), jpeg.subarray(2)]);
}

export async function plainPng(width = 40, height = 30): Promise<Buffer> {
  return new Jimp({ width, height, color: 0xf2a524ff }).getBuffer('image/png');
}

/** One PNG chunk: length, type, data, CRC-32 over type and data (PNG spec, ISO/IEC 15948 §5.3). */
function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

/** A 68-byte PNG whose header declares width × height pixels (8-bit RGBA) over a tiny compressed stream. */
export function pngDeclaring(width: number, height: number): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type RGBA
  return Buffer.concat([PNG_SIGNATURE, pngChunk('IHDR', ihdr), pngChunk('IDAT', deflateSync(Buffer.alloc(16))), pngChunk('IEND', Buffer.alloc(0))]);
}

/** A real PNG with one bit of its image data flipped, so its CRC no longer matches. */
export async function pngWithBadCrc(): Promise<Buffer> {
  const png = Buffer.from(await plainPng());
  const idat = png.indexOf(Buffer.from('IDAT', 'latin1'));
  png[idat + 6] ^= 0x01;
  return png;
}

/** The first half of a real JPEG (an upload or export cut off). */
export async function truncatedJpeg(): Promise<Buffer> {
  const jpeg = await new Jimp({ width: 120, height: 90, color: 0x2f7c6fff }).getBuffer('image/jpeg');
  return jpeg.subarray(0, Math.floor(jpeg.length / 2));
}

/** A file that starts as a PNG (signature and header) and goes on as an HTML page with a script. */
export function pngHtmlPolyglot(): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(32, 0);
  ihdr.writeUInt32BE(32, 4);
  ihdr[8] = 8;
  ihdr[9] = 6;
  return Buffer.concat([PNG_SIGNATURE, pngChunk('IHDR', ihdr), Buffer.from('<html><body><script>alert(document.cookie)</script></body></html>')]);
}
