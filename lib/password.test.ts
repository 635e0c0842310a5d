import { describe, expect, it } from 'vitest';
import { DUMMY_HASH, SCRYPT_COST, hashPassword, needsRehash, verifyPassword } from './password';

describe('scrypt password hashing', () => {
  it('agrees with the published scrypt test vector', async () => {
    // RFC 7914 §12, second vector: P="password", S="NaCl", N=1024, r=8, p=16, dkLen=64.
    const key =
      'fdbabe1c9d3472007856e7190d01e9fe7c6ad7cbc8237830e77376634b3731622eaf30d92e22a3886ff109279d9830dac727afb94a83ee6d8360cbdfa2cc0640';
    const stored = ['scrypt', 1024, 8, 16, Buffer.from('NaCl').toString('base64url'), Buffer.from(key, 'hex').toString('base64url')].join('$');
    expect(await verifyPassword('password', stored)).toBe(true);
    expect(await verifyPassword('Password', stored)).toBe(false);
  });

  it('hashes at the OWASP cost N=2^17, r=8, p=1, round-trips and salts every hash', async () => {
    const a = await hashPassword('a-long-enough-password');
    const b = await hashPassword('a-long-enough-password');
    expect(a).not.toBe(b);
    expect(a.split('$').slice(0, 4)).toEqual(['scrypt', '131072', '8', '1']);
    expect(await verifyPassword('a-long-enough-password', a)).toBe(true);
    expect(await verifyPassword('a-long-enough-passworD', a)).toBe(false);
    expect(needsRehash(a)).toBe(false);
  });

  it('still verifies a hash of the older cost, and marks it for rehashing', async () => {
    // The cost used before the hardening issue: N=2^15.
    const { scryptSync } = await import('node:crypto');
    const salt = Buffer.from('0123456789abcdef');
    const key = scryptSync('old-cost-password', salt, 64, { N: 2 ** 15, r: 8, p: 1, maxmem: 64 * 1024 * 1024 });
    const stored = ['scrypt', 2 ** 15, 8, 1, salt.toString('base64url'), key.toString('base64url')].join('$');
    expect(await verifyPassword('old-cost-password', stored)).toBe(true);
    expect(needsRehash(stored)).toBe(true);
  });

  it('keeps the never-matching dummy hash at the current cost', async () => {
    expect(DUMMY_HASH.split('$').slice(1, 4).map(Number)).toEqual([SCRYPT_COST.N, SCRYPT_COST.r, SCRYPT_COST.p]);
    expect(needsRehash(DUMMY_HASH)).toBe(false);
    expect(await verifyPassword('anything', DUMMY_HASH)).toBe(false);
  });

  it('treats a malformed stored hash as a mismatch, not an error', async () => {
    expect(await verifyPassword('x', 'plain-text')).toBe(false);
    expect(await verifyPassword('x', 'bcrypt$1$2$3$4$5')).toBe(false);
    expect(await verifyPassword('x', 'scrypt$abc$8$1$AA$AA')).toBe(false);
    expect(needsRehash('plain-text')).toBe(false);
  });
});
