import { afterEach, describe, expect, it, vi } from 'vitest';
import { clientKeySchema } from '../../shared/schemas/notices';
import { newWriteKey } from '../../src/lib/write-key';

afterEach(() => vi.unstubAllGlobals());

describe('write key', () => {
  it('write key · a secure page · a UUID (RFC 9562 form) the server takes as an Idempotency-Key', () => {
    const key = newWriteKey();
    // RFC 9562 §5.4: version 4, variant 10xx
    expect(key).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(clientKeySchema.safeParse(key).success).toBe(true);
  });

  it('write key · a page on a plain-http address (no randomUUID) · 32 hex digits the server takes, never the same twice', () => {
    vi.stubGlobal('isSecureContext', false);
    const keys = new Set(Array.from({ length: 50 }, () => newWriteKey()));
    expect(keys.size).toBe(50);
    for (const key of keys) {
      expect(key).toMatch(/^[0-9a-f]{32}$/);
      expect(clientKeySchema.safeParse(key).success).toBe(true);
    }
  });
});
