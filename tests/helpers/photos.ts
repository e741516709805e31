// A real JPEG (encoded by jimp) with an EXIF block spliced in by hand: an orientation tag and GPS
// coordinates, as a phone would write them (TIFF 6.0 / Exif 2.3 tag layout).
import { Jimp } from 'jimp';

function exifSegment(orientation: number): Buffer {
  // little-endian TIFF: header, IFD0 (Orientation, GPS pointer), GPS IFD (lat ref + lat)
  const tiff = Buffer.alloc(8 + 2 + 2 * 12 + 4 + 2 + 2 * 12 + 4 + 24);
  let o = 0;
  tiff.write('II', o); o += 2;
  tiff.writeUInt16LE(42, o); o += 2;
  tiff.writeUInt32LE(8, o); o += 4;
  const gpsIfd = 8 + 2 + 2 * 12 + 4;
  tiff.writeUInt16LE(2, o); o += 2;
  tiff.writeUInt16LE(0x0112, o); tiff.writeUInt16LE(3, o + 2); tiff.writeUInt32LE(1, o + 4); tiff.writeUInt16LE(orientation, o + 8); o += 12;
  tiff.writeUInt16LE(0x8825, o); tiff.writeUInt16LE(4, o + 2); tiff.writeUInt32LE(1, o + 4); tiff.writeUInt32LE(gpsIfd, o + 8); o += 12;
  tiff.writeUInt32LE(0, o); o += 4;
  const rationals = gpsIfd + 2 + 2 * 12 + 4;
  tiff.writeUInt16LE(2, o); o += 2;
  tiff.writeUInt16LE(0x0001, o); tiff.writeUInt16LE(2, o + 2); tiff.writeUInt32LE(2, o + 4); tiff.write('N\0', o + 8, 'latin1'); o += 12;
  tiff.writeUInt16LE(0x0002, o); tiff.writeUInt16LE(5, o + 2); tiff.writeUInt32LE(3, o + 4); tiff.writeUInt32LE(rationals, o + 8); o += 12;
  tiff.writeUInt32LE(0, o); o += 4;
  for (const [num, den] of [[51, 1], [30, 1], [1234, 100]]) {
    tiff.writeUInt32LE(num, o); tiff.writeUInt32LE(den, o + 4); o += 8;
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
