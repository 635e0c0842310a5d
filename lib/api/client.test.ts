import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiClientError, fetchJson } from './client';

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('fetchJson', () => {
  it('turns the one error shape into ApiClientError: message, fields and the extra fields', async () => {
    const body = { error: 'Someone saved version 4 after the version you started from.', latestVersion: 4 };
    vi.stubGlobal('fetch', async () => Response.json(body, { status: 409 }));
    const err = await fetchJson('/api/cells/x/versions', { method: 'POST', body: {} }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiClientError);
    expect(err).toMatchObject({ status: 409, message: body.error, fields: undefined, extra: { latestVersion: 4 } });
  });

  it('keeps field errors apart from the extra fields', async () => {
    const body = { error: 'One row has problems; nothing was imported.', fields: { 'rows.3.rack': ['Not a number.'] }, rowErrors: [{ row: 3, column: 'rack', message: 'Not a number.' }], problemCount: 1 };
    vi.stubGlobal('fetch', async () => Response.json(body, { status: 422 }));
    const err = (await fetchJson('/api/cells/x/csv/point-map').catch((e: unknown) => e)) as ApiClientError;
    expect(err.fields).toEqual(body.fields);
    expect(err.extra).toEqual({ rowErrors: body.rowErrors, problemCount: 1 });
  });

  it('answers the JSON of a 2xx', async () => {
    vi.stubGlobal('fetch', async () => Response.json({ ok: true }, { status: 201 }));
    expect(await fetchJson('/api/anything')).toEqual({ ok: true });
  });
});
