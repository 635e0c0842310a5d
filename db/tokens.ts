import 'server-only';
import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';

/** A fresh single-use token (256 bits, URL-safe) and the hash that is stored instead of it. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

/** The SHA-256 (hex) stored for a token: the token itself is never stored. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** The tables that store single-use link tokens (only their hash, in `token_hash`). */
type TokenTable = 'invitations' | 'password_resets';

/** Why a link token cannot be redeemed. */
export type TokenRefusal = 'invalid' | 'used' | 'revoked' | 'expired';

/** What the refusal reads of a token row: its redeemed-at and revoked-at columns, and the computed expiry. */
interface TokenRow {
  accepted_at?: Date | null;
  used_at?: Date | null;
  revoked_at?: Date | null;
  is_expired: boolean;
}

/**
 * The row of `table` holding `token` (looked up by its hash), with `is_expired` computed by
 * the database's clock so app and database never disagree about expiry. With `forUpdate`,
 * `k` must be a transaction: the row stays locked until it ends, so a double submit
 * redeems the token once.
 */
export async function findTokenRow(k: Knex, table: TokenTable, token: string, { forUpdate = false } = {}) {
  const query = k(table)
    .where('token_hash', hashToken(token))
    .select('*', k.raw('expires_at <= now() as is_expired'));
  return (forUpdate ? query.forUpdate() : query).first();
}

/**
 * Why the row may not be redeemed, or null when it may: missing, already redeemed
 * (`usedColumn` set), revoked, expired, checked in that order. Password resets are never
 * revoked (a new one retires the old on use), so they never answer 'revoked'.
 */
export function tokenRefusal(row: TokenRow | undefined, usedColumn: 'used_at'): Exclude<TokenRefusal, 'revoked'> | null;
export function tokenRefusal(row: TokenRow | undefined, usedColumn: 'accepted_at'): TokenRefusal | null;
export function tokenRefusal(row: TokenRow | undefined, usedColumn: 'accepted_at' | 'used_at'): TokenRefusal | null {
  if (!row) return 'invalid';
  if (row[usedColumn]) return 'used';
  if (row.revoked_at) return 'revoked';
  if (row.is_expired) return 'expired';
  return null;
}
