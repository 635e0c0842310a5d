import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson, documentSha256 } from './hash';

describe('canonical JSON and document hashes', () => {
  it('sorts keys at every depth and drops undefined members', () => {
    expect(canonicalJson({ b: 1, a: { d: [1, { z: 0, y: undefined }], c: null } })).toBe('{"a":{"c":null,"d":[1,{"z":0}]},"b":1}');
  });

  it('hashes the same document the same whatever its key order', () => {
    expect(documentSha256({ x: 1, y: [2, 3] })).toBe(documentSha256({ y: [2, 3], x: 1 }));
    expect(documentSha256({ x: 1 })).not.toBe(documentSha256({ x: 2 }));
  });

  it('is SHA-256 of the canonical text', () => {
    // The SHA-256 of the three bytes "abc" (FIPS 180-2, appendix B.1 example).
    expect(createHash('sha256').update('abc').digest('hex')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(documentSha256('abc')).toBe(createHash('sha256').update('"abc"').digest('hex'));
    expect(documentSha256({ a: -0 })).toBe(documentSha256({ a: 0 }));
  });
});
