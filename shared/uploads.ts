// Upload limits, enforced by the server and shown by the client before a byte is sent.
export const UPLOAD_LIMITS = {
  model: 100 * 1024 * 1024,
  photo: 15 * 1024 * 1024,
  source: 100 * 1024 * 1024,
  filesPerRequest: 12,
} as const;

/**
 * Photos larger than this (declared width × height) are refused before anything decodes them:
 * a 50-megapixel phone or camera shot is the largest a crew sends, and decoding one takes 200 MB.
 */
export const PHOTO_MAX_PIXELS = 50_000_000;

/** What a printable rigging part can need; anything beyond is refused at upload with a 422. */
export const MODEL_LIMITS = {
  /** Triangles after expanding 3MF components and build items: a little over the ~2.1 million facets a 100 MB binary STL holds. */
  maxTriangles: 2_500_000,
  /** Bytes a 3MF may unpack to: the model XML of 2.5 million triangles takes about 200 MB. */
  maxUnpackedBytes: 256 * 1024 * 1024,
  /** Largest extent of a part, in mm: no desktop or large-format printer builds anything longer than 2 m. */
  maxExtentMm: 2000,
} as const;
