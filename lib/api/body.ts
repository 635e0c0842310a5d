import type { z } from 'zod';
import { ApiError, parseJsonValue } from './errors';

const KIB = 1024;
const MIB = 1024 * KIB;

/**
 * Caps on request bodies, in bytes, by what the route takes. Every body is read through
 * {@link readBody}, which counts the bytes as they stream in, whatever Content-Length says.
 * - auth: sign-in, reset and invitation forms (an e-mail, a password, a token);
 * - form: every other small JSON form (names, dates, a diagnosis, a grade override);
 * - cell: a whole cell document (a save or an import): the schema allows 20,000 blocks and
 *   80,000 connections, which stays under 16 MiB of JSON;
 * - drill: a drill (a brief of up to 40,000 characters, fault cards, rules);
 * - csv: a CSV import (MAX_CSV_CHARS characters inside a JSON string, up to 4 bytes each);
 * - batch: a run's event batch, which may carry `download` events (docs/api.md);
 * - asset: a brief image (1 MiB) plus its multipart envelope.
 */
export const BODY_LIMITS = {
  auth: 16 * KIB,
  form: 64 * KIB,
  cell: 16 * MIB,
  drill: MIB,
  csv: 4 * MIB,
  batch: 4 * MIB,
  asset: MIB + 64 * KIB,
} as const;

export type BodyLimit = keyof typeof BODY_LIMITS;

function tooLarge(limit: number, what?: TooLarge): ApiError {
  if (what) return new ApiError(413, what.message, { [what.field]: [`At most ${what.bytes} bytes.`] });
  return new ApiError(413, `The request body is larger than ${limit} bytes.`, { _: [`At most ${limit} bytes.`] });
}

/** How a 413 names what was too large, when it is one field of the body (an uploaded file). */
export interface TooLarge {
  field: string;
  message: string;
  /** The limit as the caller states it (the file's own cap, without the envelope). */
  bytes: number;
}

/**
 * Reads a request body as bytes, refusing it with 413 as soon as it passes `limit` bytes:
 * at once when Content-Length already says so, else while it streams (the stream is
 * cancelled, so the rest is never buffered). A body that claims less than it sends is cut
 * at the cap all the same.
 */
export async function readBody(req: Request, limit: number, what?: TooLarge): Promise<Uint8Array<ArrayBuffer>> {
  const declared = req.headers.get('content-length');
  if (declared !== null && Number(declared) > limit) {
    await req.body?.cancel().catch(() => undefined);
    throw tooLarge(limit, what);
  }
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(limit, what);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** The body as UTF-8 text, capped (see {@link readBody}); malformed UTF-8 is a 400. */
export async function readBodyText(req: Request, limit: number): Promise<string> {
  const bytes = await readBody(req, limit);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new ApiError(400, 'The request body is not valid UTF-8.');
  }
}

/** True for `application/json` and `application/<something>+json`, with or without parameters. */
export function isJsonContentType(value: string | null): boolean {
  if (!value) return false;
  const type = value.split(';')[0].trim().toLowerCase();
  return type === 'application/json' || (type.startsWith('application/') && type.endsWith('+json'));
}

/** 415 unless the request says its body is JSON. */
export function requireJsonContentType(req: Request): void {
  if (!isJsonContentType(req.headers.get('content-type'))) {
    throw new ApiError(415, 'Send the body as JSON with Content-Type: application/json.', { 'content-type': ['Expected application/json.'] });
  }
}

/**
 * Parse a JSON body: 415 unless it is sent as JSON, 413 past the cap (`form` unless the
 * route names a larger one), 400 when it is not JSON, 422 naming the fields that do not fit.
 */
export async function parseJsonBody<S extends z.ZodType>(req: Request, schema: S, limit: BodyLimit = 'form'): Promise<z.output<S>> {
  requireJsonContentType(req);
  return parseJsonText(await readBodyText(req, BODY_LIMITS[limit]), schema);
}

/** parseJsonBody for a body already read as text. */
export function parseJsonText<S extends z.ZodType>(text: string, schema: S): z.output<S> {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new ApiError(400, 'The request body must be valid JSON.');
  }
  return parseJsonValue(raw, schema);
}

/** What {@link readFormFile} reads and how its refusals are worded. */
export interface FormFileSpec {
  /** The form field holding the file. */
  field: string;
  /** The file's own cap. */
  maxBytes: number;
  /** The whole body's cap: the file plus its multipart framing. */
  limit: BodyLimit;
  /** The 413's message ("The image is larger than 1 MiB."). */
  tooLarge: string;
  /** The 422's field message when the field is missing ("Choose an image file."). */
  missing: string;
  /** The 400's message when the body is not multipart form data. */
  notForm: string;
}

/**
 * One file from a multipart form body: 413 naming the field past `maxBytes` (the body is cut
 * at its `limit` as it streams, so nothing larger is buffered), 400 when the body
 * is not multipart form data, 422 naming the field when it is missing or empty. What the file
 * is (its type, its name) is the caller's to check.
 */
export async function readFormFile(req: Request, spec: FormFileSpec): Promise<File> {
  const tooBig: TooLarge = { field: spec.field, message: spec.tooLarge, bytes: spec.maxBytes };
  const bytes = await readBody(req, BODY_LIMITS[spec.limit], tooBig);
  let form: FormData;
  try {
    form = await new Response(bytes, { headers: { 'content-type': req.headers.get('content-type') ?? '' } }).formData();
  } catch {
    throw new ApiError(400, spec.notForm);
  }
  const file = form.get(spec.field);
  if (!file || typeof file === 'string') throw new ApiError(422, 'Some fields are not valid.', { [spec.field]: [spec.missing] });
  if (file.size > spec.maxBytes) throw tooLarge(spec.maxBytes, tooBig);
  if (file.size === 0) throw new ApiError(422, 'Some fields are not valid.', { [spec.field]: ['The file is empty.'] });
  return file;
}
