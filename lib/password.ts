import { randomBytes, scrypt, timingSafeEqual } from 'node:crypto';

/**
 * scrypt cost for new hashes: N=2^17, r=8 (1024-byte blocks), p=1 — the minimum the OWASP
 * Password Storage Cheat Sheet ("scrypt" section, May 2023 revision) gives when Argon2id is
 * not at hand. Checked against a page quoting the cheat sheet, not the cheat sheet itself.
 * On this project's 2-core machine one hash takes about 0.37 s and 128 MiB.
 */
export const SCRYPT_COST = { N: 2 ** 17, r: 8, p: 1 } as const;
const KEY_LEN = 64;
// scrypt needs 128·N·r bytes (128 MiB here) plus a little; node refuses maxmem of exactly 128 MiB.
// 256 MiB also covers verifying any older, cheaper hash still stored.
const MAX_MEM = 2 * 128 * SCRYPT_COST.N * SCRYPT_COST.r;

/**
 * At most this many derivations run at once in this process. Each holds 128 MiB, and scrypt
 * runs on libuv's thread pool (4 threads by default), which also serves file reads and DNS:
 * two at a time caps the memory at 256 MiB and leaves threads for the rest of the app.
 * A burst of sign-ins queues here instead.
 */
const MAX_CONCURRENT = 2;
let running = 0;
const waiting: (() => void)[] = [];

async function withSlot<T>(work: () => Promise<T>): Promise<T> {
  if (running >= MAX_CONCURRENT) await new Promise<void>((resolve) => waiting.push(resolve));
  running += 1;
  try {
    return await work();
  } finally {
    running -= 1;
    waiting.shift()?.();
  }
}

function derive(password: string, salt: Buffer, n: number, r: number, p: number): Promise<Buffer> {
  return withSlot(
    () =>
      new Promise((resolve, reject) => {
        scrypt(password.normalize('NFKC'), salt, KEY_LEN, { N: n, r, p, maxmem: MAX_MEM }, (err, key) =>
          err ? reject(err) : resolve(key),
        );
      }),
  );
}

/** Hash a password as `scrypt$N$r$p$salt$key` (base64url parts) at the current cost. */
export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(16);
  const { N, r, p } = SCRYPT_COST;
  const key = await derive(password, salt, N, r, p);
  return ['scrypt', N, r, p, salt.toString('base64url'), key.toString('base64url')].join('$');
}

interface ParsedHash {
  n: number;
  r: number;
  p: number;
  salt: Buffer;
  key: Buffer;
}

function parseHash(stored: string): ParsedHash | null {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return null;
  const [, n, r, p, saltText, keyText] = parts;
  const numbers = [Number(n), Number(r), Number(p)];
  if (!numbers.every((x) => Number.isSafeInteger(x) && x > 0)) return null;
  return { n: numbers[0], r: numbers[1], p: numbers[2], salt: Buffer.from(saltText, 'base64url'), key: Buffer.from(keyText, 'base64url') };
}

/** Constant-time check of a password against a stored hash; false on any malformed hash. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parsed = parseHash(stored);
  if (!parsed) return false;
  const key = await derive(password, parsed.salt, parsed.n, parsed.r, parsed.p);
  return key.length === parsed.key.length && timingSafeEqual(key, parsed.key);
}

/**
 * True when a stored hash was made with other parameters than today's (an older, cheaper
 * cost): after a successful sign-in the password is hashed again at the current cost.
 */
export function needsRehash(stored: string): boolean {
  const parsed = parseHash(stored);
  if (!parsed) return false;
  return parsed.n !== SCRYPT_COST.N || parsed.r !== SCRYPT_COST.r || parsed.p !== SCRYPT_COST.p || parsed.key.length !== KEY_LEN;
}

/**
 * A hash that can never match, at the current cost, used to spend the same time on unknown
 * accounts as on known ones so timing does not reveal whether an e-mail exists.
 */
export const DUMMY_HASH = ['scrypt', SCRYPT_COST.N, SCRYPT_COST.r, SCRYPT_COST.p, 'AAAAAAAAAAAAAAAAAAAAAA', Buffer.alloc(KEY_LEN).toString('base64url')].join('$');
