/**
 * Hardening issue #9, points 4 and 5 against the real PostgreSQL and mail catcher: the
 * refused production secrets, a parallel burst of failed sign-ins, resets that answer alike
 * for known and unknown addresses and are throttled, the scrypt upgrade on sign-in,
 * sign-out ending the session, and next-auth's redirect rule.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { scryptSync } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decode, encode } from 'next-auth/jwt';
import * as resets from '@/app/api/password-resets/route';
import * as cellsList from '@/app/api/cells/route';
import { DEVELOPMENT_SECRET, PUBLISHED_SECRETS, parseEnv } from '@/lib/env';
import { authenticate } from '@/lib/auth/credentials';
import { authOptions } from '@/lib/auth/options';
import { PEER_ADDRESS_HEADER, installPeerAddressHeader } from '@/lib/auth/client-address';
import { settleAfterResponse } from '@/lib/after-response';
import { SCRYPT_COST, hashPassword, verifyPassword } from '@/lib/password';
import { closeDb, db } from '@/db/knex';
import { createUser } from '@/db/users';
import { TEST_ENV } from './test-env';
import { call, makeUser, uniqueEmail } from './helpers';

const GOOD_SECRET = 'k3Jx9vQeT1m2p0ZrW8yB5nC7dF4gH6jL1sA9uE2oI3w=';

beforeAll(() => {
  // What instrumentation.ts does in `next start`: from here on a request's address is its stamped peer.
  installPeerAddressHeader();
});

afterAll(async () => {
  await settleAfterResponse();
  await closeDb();
});

describe('the session secret (point 4)', () => {
  const production = (secret: string | undefined) => parseEnv({ NODE_ENV: 'production', S3_BUCKET: 'cellwright-files', ...(secret === undefined ? {} : { NEXTAUTH_SECRET: secret }) });

  it('refuses a missing secret in production, saying how to set one', () => {
    expect(() => production(undefined)).toThrow(/NEXTAUTH_SECRET is not set.*openssl rand -base64 48/);
    expect(() => production('')).toThrow(/NEXTAUTH_SECRET is not set/);
  });

  it('refuses a secret shorter than 32 bytes', () => {
    expect(() => production('x'.repeat(31))).toThrow(/shorter than 32 bytes.*openssl rand/);
    expect(production('x'.repeat(32)).NEXTAUTH_SECRET).toBe('x'.repeat(32));
  });

  it('refuses the old published default and every other secret written in the repository', () => {
    expect(() => production('cellwright-development-secret-change-me')).toThrow(/published in the Cellwright repository/);
    for (const secret of [...PUBLISHED_SECRETS, TEST_ENV.NEXTAUTH_SECRET]) expect(() => production(secret)).toThrow(/NEXTAUTH_SECRET/);
  });

  it('accepts a random secret, and keeps development and test working without one', () => {
    expect(production(GOOD_SECRET).NEXTAUTH_SECRET).toBe(GOOD_SECRET);
    expect(parseEnv({ NODE_ENV: 'development' }).NEXTAUTH_SECRET).toBe(DEVELOPMENT_SECRET);
    expect(parseEnv({ NODE_ENV: 'test' }).NEXTAUTH_SECRET).toBe(DEVELOPMENT_SECRET);
    // `next build` loads route modules in production mode but signs nothing.
    expect(() => parseEnv({ NODE_ENV: 'production', NEXT_PHASE: 'phase-production-build' })).not.toThrow();
  });

  it('every secret the tests use is at least 32 bytes', () => {
    expect(Buffer.byteLength(TEST_ENV.NEXTAUTH_SECRET)).toBeGreaterThanOrEqual(32);
  });

  // Needs a build (scripts/test.sh builds before the integration tests; NEXT_DIST_DIR names a parallel one).
  const distDir = process.env.NEXT_DIST_DIR || '.next';
  it.skipIf(!existsSync(`${distDir}/BUILD_ID`))(
    '`next start` in production exits at start-up with the published default secret',
    async () => {
      const child = spawn('node_modules/.bin/next', ['start', '--hostname', '127.0.0.1', '--port', '3291'], {
        env: { ...process.env, ...TEST_ENV, NODE_ENV: 'production', NEXTAUTH_SECRET: 'cellwright-development-secret-change-me', NEXT_DIST_DIR: distDir },
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      let output = '';
      child.stdout.on('data', (d) => (output += d));
      child.stderr.on('data', (d) => (output += d));
      const code = await new Promise<number | null>((resolve) => {
        const timer = setTimeout(() => {
          child.kill('SIGTERM');
          resolve(-1);
        }, 25_000);
        child.once('exit', (c) => {
          clearTimeout(timer);
          resolve(c);
        });
      });
      expect(code, output).not.toBe(-1);
      expect(code).not.toBe(0);
      expect(output).toMatch(/Cellwright cannot start: .*NEXTAUTH_SECRET is a value published in the Cellwright repository/);
      expect(output).toMatch(/openssl rand -base64 48/);
    },
    40_000,
  );
});

describe('a parallel burst of failed sign-ins (limit 10 in 15 minutes)', () => {
  it('checks at most 10 guesses for one account, refuses the rest, and the table counts what was checked', async () => {
    const user = await makeUser('student', 'the-real-password');
    const results = await Promise.all(
      Array.from({ length: 30 }, (_, i) => authenticate({ email: user.email, password: `guess-${i}`, address: `198.51.100.${i + 1}` })),
    );
    const checked = results.filter((r) => !r.ok && r.reason === 'invalid').length;
    const limited = results.filter((r) => !r.ok && r.reason === 'rate-limited').length;
    expect(checked + limited).toBe(30);
    // Attempts are decided one after the other, each seeing the checks still in flight, and
    // parallel attempts on one account are refused at once: exactly the limit is checked.
    expect(checked).toBe(10);
    expect(limited).toBe(20);
    const rows = await db()('sign_in_failures').where({ email: user.email });
    expect(rows).toHaveLength(10);
    expect(rows.every((r) => r.status === 'failed')).toBe(true);
    // Even the right password waits while the window is full.
    expect(await authenticate({ email: user.email, password: 'the-real-password', address: '198.51.100.99' })).toMatchObject({ reason: 'rate-limited' });
  }, 90_000);

  it('lets a class behind one address sign in together: attempts in flight make others wait, not fail', async () => {
    const hash = await hashPassword('class-password-1');
    const students = await Promise.all(
      Array.from({ length: 12 }, () => createUser({ email: uniqueEmail('class'), name: 'Class Member', role: 'student', passwordHash: hash })),
    );
    const address = '203.0.113.140';
    const results = await Promise.all(students.map((s) => authenticate({ email: s.email, password: 'class-password-1', address })));
    expect(results.map((r) => r.ok)).toEqual(students.map(() => true));
    expect(await db()('sign_in_failures').where({ address })).toHaveLength(0);
  }, 90_000);

  it('checks at most 10 guesses from one address across many accounts', async () => {
    const attacker = '203.0.113.77';
    const results = await Promise.all(Array.from({ length: 30 }, () => authenticate({ email: uniqueEmail('spray'), password: 'nope', address: attacker })));
    const checked = results.filter((r) => !r.ok && r.reason === 'invalid').length;
    expect(checked).toBe(10);
    // The others waited for the 10 checks in flight (they might have been a class signing in),
    // then met the full window; on a very loaded machine some may give up first ('busy').
    // Either way none of them was checked.
    const refused = results.filter((r) => !r.ok && (r.reason === 'rate-limited' || r.reason === 'busy'));
    expect(refused).toHaveLength(20);
    const [{ count }] = await db()('sign_in_failures').where({ address: attacker }).count<{ count: string }[]>({ count: '*' });
    expect(Number(count)).toBe(checked);
  }, 90_000);
});

describe('password hash upgrade on sign-in', () => {
  it('rehashes a hash of the older cost (N=2^15) at N=2^17 after a successful sign-in, keeping the sessions', async () => {
    const salt = Buffer.from('fixed-salt-16byt');
    const oldKey = scryptSync('old-cost-password', salt, 64, { N: 2 ** 15, r: 8, p: 1, maxmem: 64 * 1024 * 1024 });
    const oldHash = ['scrypt', 2 ** 15, 8, 1, salt.toString('base64url'), oldKey.toString('base64url')].join('$');
    const user = await createUser({ email: uniqueEmail('oldcost'), name: 'Old Cost', role: 'student', passwordHash: oldHash });

    const res = await authenticate({ email: user.email, password: 'old-cost-password', address: '198.51.100.200' });
    expect(res.ok).toBe(true);
    const row = await db()('users').where({ id: user.id }).first();
    expect(row.password_hash).not.toBe(oldHash);
    expect(row.password_hash.split('$').slice(0, 4)).toEqual(['scrypt', String(SCRYPT_COST.N), String(SCRYPT_COST.r), String(SCRYPT_COST.p)]);
    expect(await verifyPassword('old-cost-password', row.password_hash)).toBe(true);
    expect(row.session_generation).toBe(0);

    // The next sign-in finds nothing to upgrade.
    expect((await authenticate({ email: user.email, password: 'old-cost-password', address: '198.51.100.200' })).ok).toBe(true);
    expect((await db()('users').where({ id: user.id }).first()).password_hash).toBe(row.password_hash);
  });

  it('does not touch the hash after a failed sign-in', async () => {
    const salt = Buffer.from('other-salt-16byt');
    const key = scryptSync('right-one-123', salt, 64, { N: 2 ** 15, r: 8, p: 1, maxmem: 64 * 1024 * 1024 });
    const oldHash = ['scrypt', 2 ** 15, 8, 1, salt.toString('base64url'), key.toString('base64url')].join('$');
    const user = await createUser({ email: uniqueEmail('oldcost'), name: 'Old Cost', role: 'student', passwordHash: oldHash });
    expect(await authenticate({ email: user.email, password: 'wrong-one-123', address: '198.51.100.201' })).toEqual({ ok: false, reason: 'invalid' });
    expect((await db()('users').where({ id: user.id }).first()).password_hash).toBe(oldHash);
  });
});

describe('sign-out ends the session', () => {
  async function signedInCookie(userId: string, email: string, generation: number): Promise<string> {
    const token = await encode({ token: { id: userId, role: 'student', email, name: 'x', sub: userId, gen: generation }, secret: TEST_ENV.NEXTAUTH_SECRET });
    return token;
  }

  it('a copy of the token is refused after sign-out, and a new sign-in works', async () => {
    const user = await makeUser('student');
    const token = await signedInCookie(user.id, user.email, 0);
    const cookie = `next-auth.session-token=${token}`;
    expect((await call(cellsList.GET, '/api/cells', { cookie })).status).toBe(200);

    // What next-auth's /api/auth/signout does with a JWT session: decode the cookie, fire events.signOut.
    const decoded = await decode({ token, secret: TEST_ENV.NEXTAUTH_SECRET });
    await authOptions().events!.signOut!({ token: decoded!, session: undefined as never });

    expect((await call(cellsList.GET, '/api/cells', { cookie })).status).toBe(401);
    const fresh = `next-auth.session-token=${await signedInCookie(user.id, user.email, 1)}`;
    expect((await call(cellsList.GET, '/api/cells', { cookie: fresh })).status).toBe(200);
  });

  it('a sign-out with an already dead token does not end newer sessions', async () => {
    const user = await makeUser('student');
    await db()('users').where({ id: user.id }).update({ session_generation: 3 });
    const stale = await decode({ token: await signedInCookie(user.id, user.email, 2), secret: TEST_ENV.NEXTAUTH_SECRET });
    await authOptions().events!.signOut!({ token: stale!, session: undefined as never });
    expect((await db()('users').where({ id: user.id }).first()).session_generation).toBe(3);
  });
});

describe("next-auth's redirect callback: only this origin", () => {
  const baseUrl = TEST_ENV.NEXTAUTH_URL;
  it.each([
    ['/cells', `${baseUrl}/cells`],
    [`${baseUrl}/runs?x=1`, `${baseUrl}/runs?x=1`],
    ['//evil.example', baseUrl],
    ['/\\evil.example', baseUrl],
    ['https://evil.example/dashboard', baseUrl],
    ['javascript:alert(1)', baseUrl],
  ])('%j → %j', async (url, expected) => {
    expect(await authOptions().callbacks!.redirect!({ url, baseUrl })).toBe(expected);
  });
});

async function mailCount(email: string): Promise<number> {
  const [{ count }] = await db()('mail_messages').whereRaw('? = any(envelope_to)', [email]).count<{ count: string }[]>({ count: '*' });
  return Number(count);
}

function resetRequest(email: string, address: string) {
  return call(resets.POST, '/api/password-resets', { method: 'POST', body: { email }, headers: { [PEER_ADDRESS_HEADER]: address } });
}

describe('password reset requests', () => {
  it('answer a known and an unknown address with the same status and body, and mail only the known one', async () => {
    const known = await makeUser('student');
    const unknown = uniqueEmail('nobody');
    const a = await resetRequest(known.email, '192.0.2.10');
    const b = await resetRequest(unknown, '192.0.2.11');
    expect(a).toEqual(b);
    expect(a.status).toBe(202);
    await settleAfterResponse();
    expect(await mailCount(known.email)).toBe(1);
    expect(await mailCount(unknown)).toBe(0);
    expect(await db()('password_resets').where({ user_id: known.id })).toHaveLength(1);
  });

  it('do the same work before answering whether or not the account exists (the mail goes after)', async () => {
    const known = await makeUser('student');
    const times = { known: [] as number[], unknown: [] as number[] };
    for (let i = 0; i < 3; i++) {
      for (const [kind, email] of [['known', known.email], ['unknown', uniqueEmail('nobody')]] as const) {
        const started = performance.now();
        await resetRequest(email, `192.0.2.${20 + i}`);
        times[kind].push(performance.now() - started);
        await settleAfterResponse();
      }
    }
    const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[1];
    // Neither waits for the SMTP exchange or the token: both are a few database round trips.
    expect(Math.abs(median(times.known) - median(times.unknown))).toBeLessThan(50);
    expect(await mailCount(known.email)).toBe(3);
  });

  it('mail at most 3 links per e-mail in the hour, then accept silently', async () => {
    const user = await makeUser('student');
    const answers = [];
    for (let i = 0; i < 5; i++) answers.push(await resetRequest(user.email, `192.0.2.${40 + i}`));
    expect(answers.map((a) => a.status)).toEqual([202, 202, 202, 202, 202]);
    expect(new Set(answers.map((a) => JSON.stringify(a.body))).size).toBe(1);
    await settleAfterResponse();
    expect(await mailCount(user.email)).toBe(3);
  });

  it('refuse the 11th request from one address in the hour with 429 and Retry-After', async () => {
    const address = '192.0.2.99';
    for (let i = 0; i < 10; i++) expect((await resetRequest(uniqueEmail('flood'), address)).status).toBe(202);
    const req = new Request(`${TEST_ENV.APP_URL}/api/password-resets`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', [PEER_ADDRESS_HEADER]: address },
      body: JSON.stringify({ email: uniqueEmail('flood') }),
    });
    const res = await resets.POST(req, { params: Promise.resolve({}) } as never);
    expect(res.status).toBe(429);
    const retryAfter = Number(res.headers.get('retry-after'));
    expect(retryAfter).toBeGreaterThan(3000);
    expect(retryAfter).toBeLessThanOrEqual(3600);
    expect(await res.json()).toMatchObject({ error: expect.stringMatching(/Too many reset requests/) });
    // Another address is not affected; refused requests are not recorded (they do not stretch the window).
    expect((await resetRequest(uniqueEmail('flood'), '192.0.2.98')).status).toBe(202);
    const [{ count }] = await db()('password_reset_requests').where({ address }).count<{ count: string }[]>({ count: '*' });
    expect(Number(count)).toBe(10);
  });

  it('hold a parallel burst from one address to the limit', async () => {
    const address = '192.0.2.120';
    const answers = await Promise.all(Array.from({ length: 25 }, () => resetRequest(uniqueEmail('burst'), address)));
    expect(answers.filter((a) => a.status === 202)).toHaveLength(10);
    expect(answers.filter((a) => a.status === 429)).toHaveLength(15);
  });
});
