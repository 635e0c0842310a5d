import { randomBytes, scrypt, timingSafeEqual } from 'node:crypto';

// scrypt cost parameters: N=2^15, r=8, p=1 (RFC 7914 §2 recommends r=8, p=1;
// N of 2^15 or more for interactive logins is common practice in 2020s guidance).
const N = 32768;
const R = 8;
const P = 1;
const KEY_LEN = 64;
// N*r*128 bytes = 32 MiB; give scrypt headroom above that.
const MAX_MEM = 64 * 1024 * 1024;

function derive(password: string, salt: Buffer, n: number, r: number, p: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    scrypt(password.normalize('NFKC'), salt, KEY_LEN, { N: n, r, p, maxmem: MAX_MEM }, (err, key) =>
      err ? reject(err) : resolve(key),
    );
  });
}

/** Hash a password as `scrypt$N$r$p$salt$key` (base64url parts). */
export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(16);
  const key = await derive(password, salt, N, R, P);
  return ['scrypt', N, R, P, salt.toString('base64url'), key.toString('base64url')].join('$');
}

/** Constant-time check of a password against a stored hash; false on any malformed hash. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
  const [, n, r, p, saltText, keyText] = parts;
  const expected = Buffer.from(keyText, 'base64url');
  const key = await derive(password, Buffer.from(saltText, 'base64url'), Number(n), Number(r), Number(p));
  return key.length === expected.length && timingSafeEqual(key, expected);
}

/**
 * A hash that can never match, used to spend the same time on unknown
 * accounts as on known ones so timing does not reveal whether an e-mail exists.
 */
export const DUMMY_HASH =
  'scrypt$32768$8$1$AAAAAAAAAAAAAAAAAAAAAA$' + Buffer.alloc(KEY_LEN).toString('base64url');
