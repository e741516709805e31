import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../helpers/app';

const dist = mkdtempSync(join(tmpdir(), 'rigshelf-dist-'));
const script = `export const shelf = ${JSON.stringify('15 mm rod clamp '.repeat(400))};\n`;
let t: TestApp;
beforeAll(async () => {
  mkdirSync(join(dist, 'assets'));
  writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Rigshelf</title><div id="app"></div>');
  writeFileSync(join(dist, 'assets', 'index-Ab12Cd34.js'), script);
  writeFileSync(join(dist, 'favicon.svg'), '<svg xmlns="http://www.w3.org/2000/svg"/>');
  t = await createTestApp({ CLIENT_DIST: dist });
});
afterAll(async () => {
  await t?.close();
  rmSync(dist, { recursive: true, force: true });
});

describe('client files', () => {
  it('hashed asset · browser takes gzip · compressed and cached for a year, immutable', async () => {
    const res = await request(t.app).get('/assets/index-Ab12Cd34.js').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(res.headers.vary).toMatch(/Accept-Encoding/i);
    expect(res.text).toBe(script);
  });

  it('hashed asset · browser takes brotli · brotli sent', async () => {
    const res = await request(t.app)
      .get('/assets/index-Ab12Cd34.js')
      .set('Accept-Encoding', 'gzip, deflate, br')
      .buffer(true)
      .parse((r, done) => {
        r.on('data', () => undefined);
        r.on('end', () => done(null, null));
      });
    expect(res.headers['content-encoding']).toBe('br');
  });

  it('page and unhashed files · any path outside the API · revalidated on every load', async () => {
    for (const path of ['/', '/parts/some-part', '/kits/3']) {
      const res = await request(t.app).get(path);
      expect(res.status).toBe(200);
      expect(res.headers['cache-control']).toBe('no-cache');
      expect(res.text).toContain('<div id="app">');
    }
    const icon = await request(t.app).get('/favicon.svg');
    expect(icon.headers['cache-control']).toBe('no-cache');
  });
});
