// Upload limits, enforced by the server and shown by the client before a byte is sent.
export const UPLOAD_LIMITS = {
  model: 100 * 1024 * 1024,
  photo: 15 * 1024 * 1024,
  source: 100 * 1024 * 1024,
  filesPerRequest: 12,
} as const;
