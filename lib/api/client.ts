import type { ApiErrorBody } from './errors';

/** An error answer from our API, with the field errors when there are any. */
export class ApiClientError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly fields?: Record<string, string[]>,
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
    const body = (data ?? {}) as Partial<ApiErrorBody>;
    throw new ApiClientError(res.status, body.error ?? `Request failed (${res.status}).`, body.fields);
  }
  return data as T;
}
