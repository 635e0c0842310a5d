import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { ApiError } from '@/lib/api/errors';
import { loadOrNotFound, paramsOrNotFound } from './not-found';

// Next.js's notFound() throws an error whose digest names the 404 fallback (next/navigation,
// "notFound" reference; the digest shape is from the next package's http-access-fallback source).
const isNotFound = (e: unknown) => typeof (e as { digest?: unknown }).digest === 'string' && (e as { digest: string }).digest.endsWith(';404');

async function thrown(p: Promise<unknown>): Promise<unknown> {
  try {
    await p;
  } catch (e) {
    return e;
  }
  throw new Error('expected a rejection');
}

describe('paramsOrNotFound', () => {
  const schema = z.object({ id: z.uuid() });
  it('returns the parsed params', () => {
    const id = '3f1b6c2e-8a4d-4c3b-9e2f-0a1b2c3d4e5f';
    expect(paramsOrNotFound(schema, { id })).toEqual({ id });
  });
  it('is the not-found page for an id that does not parse', () => {
    let caught: unknown;
    try {
      paramsOrNotFound(schema, { id: 'not-a-uuid' });
    } catch (e) {
      caught = e;
    }
    expect(isNotFound(caught)).toBe(true);
  });
});

describe('loadOrNotFound', () => {
  it('passes the loaded value through', async () => {
    await expect(loadOrNotFound(Promise.resolve({ title: 'Drill' }))).resolves.toEqual({ title: 'Drill' });
  });
  it('turns an ApiError 404 into the not-found page', async () => {
    expect(isNotFound(await thrown(loadOrNotFound(Promise.reject(new ApiError(404, 'No such drill.')))))).toBe(true);
  });
  it('turns only the listed statuses into the not-found page', async () => {
    expect(isNotFound(await thrown(loadOrNotFound(Promise.reject(new ApiError(403, 'Shared only.')), [404, 403])))).toBe(true);
    const refused = await thrown(loadOrNotFound(Promise.reject(new ApiError(403, 'Shared only.'))));
    expect(refused).toBeInstanceOf(ApiError);
    expect((refused as ApiError).status).toBe(403);
  });
  it('throws any other error on', async () => {
    const boom = new Error('database down');
    expect(await thrown(loadOrNotFound(Promise.reject(boom)))).toBe(boom);
  });
});
