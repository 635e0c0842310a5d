import { z } from 'zod';

export type ApiStatus = 400 | 401 | 403 | 404 | 409 | 413 | 422 | 429 | 500;

/** The one error body every route handler returns: `{ error, fields? }`. */
export interface ApiErrorBody {
  error: string;
  fields?: Record<string, string[]>;
}

/** Thrown inside a handler to end it with a given status; turned into JSON by `apiRoute`. */
export class ApiError extends Error {
  constructor(
    public readonly status: ApiStatus,
    message: string,
    public readonly fields?: Record<string, string[]>,
  ) {
    super(message);
  }
}

export function errorResponse(status: ApiStatus, error: string, fields?: Record<string, string[]>): Response {
  const body: ApiErrorBody = fields ? { error, fields } : { error };
  return Response.json(body, { status, headers: { 'cache-control': 'no-store' } });
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

/** Parse a JSON body: 400 when it is not JSON, 422 naming the fields when it does not fit the schema. */
export async function parseJsonBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.output<S>> {
  let raw: unknown;
  try {
    raw = await req.json();
  } catch {
    throw new ApiError(400, 'The request body must be valid JSON.');
  }
  return parseJsonValue(raw, schema);
}

/** parseJsonBody for a body already read as text (a handler that had to bound its size first). */
export function parseJsonText<S extends z.ZodType>(text: string, schema: S): z.output<S> {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new ApiError(400, 'The request body must be valid JSON.');
  }
  return parseJsonValue(raw, schema);
}

function parseJsonValue<S extends z.ZodType>(raw: unknown, schema: S): z.output<S> {
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
      return await handler(req, ctx);
    } catch (err) {
      if (err instanceof ApiError) return errorResponse(err.status, err.message, err.fields);
      console.error('[api] unhandled error', req.method, new URL(req.url).pathname, err);
      return errorResponse(500, 'Something went wrong on the server.');
    }
  };
}
