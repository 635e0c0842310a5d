import { describe, expect, it } from 'vitest';
import { parseEnv } from '@/lib/env';
import { storageSettings } from './object-store';

// A production configuration that passes every other check (a 48-character secret, not a published one).
const PRODUCTION = { NODE_ENV: 'production', NEXTAUTH_SECRET: 'x7Kq2vN9pL4sR8tW1yB6mD3fH5jC0gZeUaQiOoPlMnVbXcYw' };

describe('object storage settings (lib/env.ts)', () => {
  it('outside production default to the local S3 fake: loopback endpoint, its key pair, path-style', () => {
    expect(storageSettings(parseEnv({ NODE_ENV: 'test' }))).toEqual({
      endpoint: 'http://127.0.0.1:4568',
      bucket: 'cellwright',
      region: 'us-east-1',
      credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
      forcePathStyle: true,
    });
  });

  it('in production need a bucket, and otherwise leave endpoint and credentials to the provider', () => {
    expect(() => parseEnv(PRODUCTION)).toThrow(/S3_BUCKET: set S3_BUCKET/);
    expect(storageSettings(parseEnv({ ...PRODUCTION, S3_BUCKET: 'plant-files', S3_REGION: 'eu-north-1' }))).toEqual({
      endpoint: undefined,
      bucket: 'plant-files',
      region: 'eu-north-1',
      credentials: undefined,
      forcePathStyle: false,
    });
    // `next build` loads the app without a bucket: it never touches storage.
    expect(() => parseEnv({ NODE_ENV: 'production', NEXT_PHASE: 'phase-production-build' })).not.toThrow();
  });

  it('refuse one key without the other, a bad bucket name and an endpoint that is not a URL, naming the variable', () => {
    expect(() => parseEnv({ NODE_ENV: 'test', S3_ACCESS_KEY_ID: 'AKIAEXAMPLE' })).toThrow(/S3_SECRET_ACCESS_KEY: set both/);
    expect(() => parseEnv({ NODE_ENV: 'test', S3_BUCKET: 'Plant_Files' })).toThrow(/S3_BUCKET: a bucket name/);
    expect(() => parseEnv({ NODE_ENV: 'test', S3_ENDPOINT: 'storage.local' })).toThrow(/S3_ENDPOINT/);
  });

  it('take an empty variable as unset and an explicit path-style choice as given', () => {
    const e = parseEnv({ NODE_ENV: 'test', S3_ENDPOINT: ' ', S3_BUCKET: '', S3_FORCE_PATH_STYLE: 'false' });
    expect(e.S3_ENDPOINT).toBe('http://127.0.0.1:4568');
    expect(e.S3_BUCKET).toBe('cellwright');
    expect(e.S3_FORCE_PATH_STYLE).toBe(false);
  });
});
