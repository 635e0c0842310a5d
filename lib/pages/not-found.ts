/**
 * The guards every `[id]` page shares: an id that does not parse, or a record the reader may
 * not see, is Next.js's not-found page, as the matching route handlers answer 404 (ids of other
 * people's records reveal nothing).
 */
import { notFound } from 'next/navigation';
import type { z } from 'zod';
import { ApiError } from '@/lib/api/errors';

/** The page's route params through their schema, or the not-found page when they do not parse. */
export function paramsOrNotFound<S extends z.ZodType>(schema: S, raw: unknown): z.output<S> {
  const parsed = schema.safeParse(raw);
  if (!parsed.success) notFound();
  return parsed.data;
}

/**
 * Awaits an access-checked loader (lib's `*ForReader`, `*ForAuthor` ...), turning the
 * `ApiError`s with one of `statuses` into the not-found page; any other error is thrown on.
 */
export async function loadOrNotFound<T>(load: Promise<T>, statuses: readonly number[] = [404]): Promise<T> {
  try {
    return await load;
  } catch (e) {
    if (e instanceof ApiError && statuses.includes(e.status)) notFound();
    throw e;
  }
}
