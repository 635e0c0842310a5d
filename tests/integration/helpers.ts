import { encode } from 'next-auth/jwt';
import { hashPassword } from '@/lib/password';
import type { Role } from '@/lib/roles';
import { db } from '@/db/knex';
import { createUser, findUserByEmail } from '@/db/users';
import type { User } from '@/db/users';
import { createCohort, listCohorts } from '@/db/cohorts';
import { DEMO_COHORT } from '@/db/seeds/demo';
import { TEST_ENV } from './test-env';

export const BASE = TEST_ENV.APP_URL;

/** The cookie next-auth would set for this user (same secret, same JWT encoding). */
export async function sessionCookie(user: Pick<User, 'id' | 'role' | 'email' | 'name'>): Promise<string> {
  const token = await encode({
    token: { id: user.id, role: user.role, email: user.email, name: user.name, sub: user.id },
    secret: TEST_ENV.NEXTAUTH_SECRET,
  });
  return `next-auth.session-token=${token}`;
}

export interface CallOptions {
  method?: string;
  cookie?: string;
  body?: unknown;
  rawBody?: string;
  params?: Record<string, string>;
  headers?: Record<string, string>;
}

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** Call a route handler the way Next.js does: a Request plus a promise of the params. */
export async function call(handler: unknown, path: string, opts: CallOptions = {}): Promise<{ status: number; body: unknown }> {
  const headers: Record<string, string> = { ...(opts.headers ?? {}) };
  if (opts.cookie) headers.cookie = opts.cookie;
  let body: string | undefined;
  if (opts.rawBody !== undefined) body = opts.rawBody;
  else if (opts.body !== undefined) body = JSON.stringify(opts.body);
  if (body !== undefined) headers['content-type'] = 'application/json';
  const req = new Request(`${BASE}${path}`, { method: opts.method ?? 'GET', headers, body });
  const res = await (handler as Handler)(req, { params: Promise.resolve(opts.params ?? {}) });
  const text = await res.text();
  // JSON answers are parsed; anything else (CSV downloads, files) comes back as text.
  const isJson = (res.headers.get('content-type') ?? '').includes('application/json');
  return { status: res.status, body: text ? (isJson ? JSON.parse(text) : text) : null };
}

let counter = 0;
/** A unique address for one test step. */
export function uniqueEmail(prefix = 'person'): string {
  counter += 1;
  return `${prefix}.${Date.now().toString(36)}.${counter}@example.test`;
}

export async function demoUser(email: string): Promise<User> {
  const user = await findUserByEmail(email);
  if (!user) throw new Error(`demo user ${email} missing: is the test database seeded?`);
  return user;
}

/**
 * One hash per distinct password, shared by the accounts a test file makes: a hash at the
 * production cost takes about 0.4 s (lib/password.ts), and tests make many accounts. Sharing a
 * salt between test accounts changes nothing they check.
 */
const hashes = new Map<string, Promise<string>>();

/** A fresh account of the given role, for tests that change or disable accounts. */
export async function makeUser(role: Role, password = 'correct-horse-battery'): Promise<User> {
  if (!hashes.has(password)) hashes.set(password, hashPassword(password));
  return createUser({ email: uniqueEmail(role), name: `Test ${role}`, role, passwordHash: await hashes.get(password)! });
}

/** A second trainer with a cohort of their own: the "another owner" of the matrix. */
export async function otherTrainerWithCohort(): Promise<{ trainer: User; cohortId: string }> {
  const trainer = await makeUser('trainer');
  const result = await createCohort(trainer.id, { name: `Other cohort ${uniqueEmail('c')}`, description: '' });
  if (!result.ok) throw new Error('could not create cohort');
  return { trainer, cohortId: result.cohort.id };
}

/** The newest captured message to an address (the catcher stores it before acknowledging the SMTP DATA). */
export async function latestMailTo(email: string): Promise<{ subject: string; text_body: string; html_body: string | null }> {
  for (let i = 0; i < 50; i++) {
    const row = await db()('mail_messages').whereRaw('? = any(envelope_to)', [email]).orderBy('id', 'desc').first();
    if (row) return row;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail to ${email}`);
}

export function linkToken(text: string, kind: 'invite' | 'reset-password'): string {
  const m = text.match(new RegExp(`${BASE.replace(/[.:/]/g, (c) => `\\${c}`)}/${kind}/([A-Za-z0-9_-]+)`));
  if (!m) throw new Error(`no ${kind} link in: ${text}`);
  return m[1];
}

/** The seeded demo cohort (other tests add more cohorts to the demo trainer, so pick it by name). */
export async function demoCohortId(trainerId: string): Promise<string> {
  const c = (await listCohorts(trainerId)).find((x) => x.name === DEMO_COHORT);
  if (!c) throw new Error('demo cohort missing: is the test database seeded?');
  return c.id;
}
