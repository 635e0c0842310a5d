import type { ApiErrorBody } from './errors';

/**
 * An error answer from our API, as the one error shape carries it: the message, the field
 * errors when there are any, and the extra fields the route named (a stale save's
 * `latestVersion`, a CSV's `rowErrors` and `problemCount`).
 */
export class ApiClientError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly fields?: Record<string, string[]>,
    public readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
  }
}

/** fetch + JSON for TanStack Query: throws ApiClientError on any non-2xx answer. */
export async function fetchJson<T>(url: string, init?: { method?: string; body?: unknown }): Promise<T> {
  const res = await fetch(url, {
    method: init?.method ?? 'GET',
    headers: init?.body !== undefined ? { 'content-type': 'application/json' } : undefined,
    body: init?.body !== undefined ? JSON.stringify(init.body) : undefined,
    credentials: 'same-origin',
  });
  const text = await res.text();
  const data = text ? (JSON.parse(text) as unknown) : null;
  if (!res.ok) {
    const { error, fields, ...extra } = (data ?? {}) as Partial<ApiErrorBody> & Record<string, unknown>;
    throw new ApiClientError(res.status, error ?? `Request failed (${res.status}).`, fields, extra);
  }
  return data as T;
}
