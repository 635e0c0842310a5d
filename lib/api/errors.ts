import { z } from 'zod';
import { env } from '@/lib/env';

export type ApiStatus = 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429 | 500 | 503;

/** The one error body every route handler returns: `{ error, fields? }`. */
export interface ApiErrorBody {
  error: string;
  fields?: Record<string, string[]>;
}

/** What an error may carry beyond `{ error, fields }`: extra body fields (a 409's `latestVersion`) and headers (`Retry-After`). */
export interface ApiErrorExtra {
  body?: Record<string, unknown>;
  headers?: Record<string, string>;
}

/** Thrown inside a handler to end it with a given status; turned into JSON by `apiRoute`. */
export class ApiError extends Error {
  constructor(
    public readonly status: ApiStatus,
    message: string,
    public readonly fields?: Record<string, string[]>,
    public readonly extra?: ApiErrorExtra,
  ) {
    super(message);
  }
}

/** A 503 that tells the client when to try again (busy engine, work past its budget). */
export function busy(message: string, retryAfterSeconds: number): ApiError {
  return new ApiError(503, message, undefined, { headers: { 'retry-after': String(Math.max(1, Math.ceil(retryAfterSeconds))) } });
}

export function errorResponse(status: ApiStatus, error: string, fields?: Record<string, string[]>, extra?: ApiErrorExtra): Response {
  const body = { ...(extra?.body ?? {}), error, ...(fields ? { fields } : {}) };
  return Response.json(body, { status, headers: { 'cache-control': 'no-store', ...(extra?.headers ?? {}) } });
}

/** Field errors keyed by dotted path ("emails.2"); "_" for errors on the whole value. */
export function fieldErrors(error: z.ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Check a parsed JSON value against a schema: 422 naming the fields that do not fit. */
export function parseJsonValue<S extends z.ZodType>(raw: unknown, schema: S): z.output<S> {
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw new ApiError(422, 'Some fields are not valid.', fieldErrors(parsed.error));
  return parsed.data;
}

/** Parse the query string: 400 naming the parameters that do not fit. */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.output<S> {
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw new ApiError(400, 'Some query parameters are not valid.', fieldErrors(parsed.error));
  return parsed.data;
}

/** Parse route params; a malformed id is a resource that does not exist (404). */
export async function parseParams<S extends z.ZodType>(params: Promise<unknown> | unknown, schema: S): Promise<z.output<S>> {
  const parsed = schema.safeParse(await params);
  if (!parsed.success) throw new ApiError(404, 'Not found.');
  return parsed.data;
}

/**
 * Wrap a route handler: ApiError becomes its JSON status, anything else a
 * bare 500 (logged on the server, never sent: no stack, no SQL).
 */
export function apiRoute<C>(handler: (req: Request, ctx: C) => Promise<Response>): (req: Request, ctx: C) => Promise<Response> {
  return async (req, ctx) => {
    try {
      refuseCrossSite(req);
      return await handler(req, ctx);
    } catch (err) {
      if (err instanceof ApiError) return errorResponse(err.status, err.message, err.fields, err.extra);
      console.error('[api] unhandled error', req.method, new URL(req.url).pathname, err);
      return errorResponse(500, 'Something went wrong on the server.');
    }
  };
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** The origins the app answers as: its configured public addresses and the request's own. */
function allowedOrigins(req: Request): Set<string> {
  const out = new Set<string>();
  for (const u of [env().APP_URL, env().NEXTAUTH_URL, req.url]) {
    try {
      out.add(new URL(u).origin);
    } catch {
      // An unparsable address allows nothing.
    }
  }
  return out;
}

/**
 * 403 for an unsafe method sent from another site: the browser says so in `Sec-Fetch-Site`
 * (cross-site, or same-site from a sibling host), or an `Origin` names another origin (or
 * `null`, an opaque one). Requests without either header (curl, scripts, the tests) pass:
 * the session cookie is SameSite=Lax and only browsers send it on their own.
 */
export function refuseCrossSite(req: Request): void {
  if (SAFE_METHODS.has(req.method.toUpperCase())) return;
  const site = req.headers.get('sec-fetch-site');
  const origin = req.headers.get('origin');
  const originAllowed = origin !== null && allowedOrigins(req).has(origin);
  if (site === 'cross-site' || (site === 'same-site' && !originAllowed) || (origin !== null && !originAllowed)) {
    throw new ApiError(403, "Requests that change data must come from the app's own pages.", { origin: [origin ?? site ?? 'unknown'] });
  }
}
