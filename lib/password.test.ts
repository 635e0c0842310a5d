import { describe, expect, it } from 'vitest';
import { hashPassword, verifyPassword } from './password';

describe('scrypt password hashing', () => {
  it('agrees with the published scrypt test vector', async () => {
    // RFC 7914 §12, second vector: P="password", S="NaCl", N=1024, r=8, p=16, dkLen=64.
    const key =
      'fdbabe1c9d3472007856e7190d01e9fe7c6ad7cbc8237830e77376634b3731622eaf30d92e22a3886ff109279d9830dac727afb94a83ee6d8360cbdfa2cc0640';
    const stored = ['scrypt', 1024, 8, 16, Buffer.from('NaCl').toString('base64url'), Buffer.from(key, 'hex').toString('base64url')].join('$');
    expect(await verifyPassword('password', stored)).toBe(true);
    expect(await verifyPassword('Password', stored)).toBe(false);
  });

  it('round-trips and salts every hash', async () => {
    const a = await hashPassword('a-long-enough-password');
    const b = await hashPassword('a-long-enough-password');
    expect(a).not.toBe(b);
    expect(a.split('$').slice(0, 4)).toEqual(['scrypt', '32768', '8', '1']);
    expect(await verifyPassword('a-long-enough-password', a)).toBe(true);
    expect(await verifyPassword('a-long-enough-passworD', a)).toBe(false);
  });

  it('treats a malformed stored hash as a mismatch, not an error', async () => {
    expect(await verifyPassword('x', 'plain-text')).toBe(false);
    expect(await verifyPassword('x', 'bcrypt$1$2$3$4$5')).toBe(false);
  });
});
