import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

const base = { DB_PASSWORD: 'x', SESSION_SECRET: 'a-secret-of-twenty-chars', NODE_ENV: 'test' };
const s3 = { STORAGE: 's3', S3_BUCKET: 'shelf', S3_ACCESS_KEY_ID: 'AKID', S3_SECRET_ACCESS_KEY: 'secret' };

describe('config · storage', () => {
  it('storage config · default · local disk, no S3 settings needed, the sweep waits for nothing', () => {
    const c = loadConfig(base);
    expect(c.STORAGE).toBe('local');
    expect(c.STORAGE_SWEEP_MIN_AGE_S).toBe(0);
  });

  it('storage config · STORAGE=s3 · region and path style default for a local fake; the sweep waits 10 minutes', () => {
    const c = loadConfig({ ...base, ...s3, S3_ENDPOINT: 'http://127.0.0.1:3425' });
    expect(c).toMatchObject({ STORAGE: 's3', S3_REGION: 'us-east-1', S3_FORCE_PATH_STYLE: true, STORAGE_SWEEP_MIN_AGE_S: 600 });
    expect(loadConfig({ ...base, ...s3, S3_FORCE_PATH_STYLE: '0', STORAGE_SWEEP_MIN_AGE_S: '0' })).toMatchObject({
      S3_FORCE_PATH_STYLE: false,
      STORAGE_SWEEP_MIN_AGE_S: 0,
    });
  });

  it('storage config · STORAGE=s3 without bucket or keys · one line per missing setting, each naming it', () => {
    let message = '';
    try {
      loadConfig({ ...base, STORAGE: 's3' });
    } catch (err) {
      message = (err as Error).message;
    }
    const lines = message.split('\n').slice(1);
    expect(lines).toHaveLength(3);
    expect(lines[0]).toMatch(/^ {2}S3_BUCKET: STORAGE=s3 needs the bucket's name$/);
    expect(lines[1]).toMatch(/^ {2}S3_ACCESS_KEY_ID: /);
    expect(lines[2]).toMatch(/^ {2}S3_SECRET_ACCESS_KEY: .*S3_ACCESS_KEY_ID/);
  });

  it('storage config · bad values · an unknown driver and an endpoint that is not http(s) are refused by name', () => {
    expect(() => loadConfig({ ...base, STORAGE: 'disk' })).toThrow(/STORAGE: use local or s3/);
    expect(() => loadConfig({ ...base, ...s3, S3_ENDPOINT: 'ftp://store' })).toThrow(/S3_ENDPOINT: use an http\(s\) address/);
  });
});
