import { createHash } from 'node:crypto';

/**
 * Canonical JSON: object keys sorted by code unit, no whitespace, `undefined` members left out
 * (as JSON.stringify does), -0 written as 0. Two documents that mean the same thing hash the
 * same whatever order PostgreSQL's jsonb or an editor kept their keys in.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value)) return 'null';
    return JSON.stringify(Object.is(value, -0) ? 0 : value) ?? 'null';
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj)
    .filter((k) => obj[k] !== undefined)
    .sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`).join(',')}}`;
}

/** SHA-256 of a value's canonical JSON (UTF-8), as 64 lower-case hex digits. */
export function documentSha256(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value), 'utf8').digest('hex');
}
