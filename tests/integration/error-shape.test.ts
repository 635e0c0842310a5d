/**
 * One error shape across the API (DEVELOPERS.md, "Route handlers"): every refusal is JSON
 * `{ error, fields?, ...extra }` with `cache-control: no-store`, whatever the route and whatever
 * the kind of failure. This walks one representative of each kind through different routes:
 * 400 (bad JSON, bad query), 401, 403 (role, another owner's record, a cross-site post), 404,
 * 409 (a duplicate; a stale version with `latestVersion`), 413 (a JSON body; an upload, naming
 * its field), 415 (not JSON; not an image), 422 (fields; CSV rows with `rowErrors` and
 * `problemCount`), 429 and 503 with Retry-After, and the bare 500.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as cohorts from '@/app/api/cohorts/route';
import * as cohort from '@/app/api/cohorts/[id]/route';
import * as adminUsers from '@/app/api/admin/users/route';
import * as cells from '@/app/api/cells/route';
import * as cell from '@/app/api/cells/[id]/route';
import * as versions from '@/app/api/cells/[id]/versions/route';
import * as csv from '@/app/api/cells/[id]/csv/[kind]/route';
import * as runs from '@/app/api/runs/route';
import * as batches from '@/app/api/runs/[id]/batches/route';
import * as assets from '@/app/api/drills/[id]/assets/route';
import * as jobStream from '@/app/api/jobs/stream/route';
import * as accept from '@/app/api/invitations/accept/route';
import { apiRoute } from '@/lib/api/errors';
import { closeDb, db } from '@/db/knex';
import { getVersion } from '@/db/cells';
import type { User } from '@/db/users';
import { BASE, demoUser, otherTrainerWithCohort, sessionCookie } from './helpers';
import { drillWorld } from './drills-fixtures';
import { streamCounter } from '@/lib/live/sse';

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

interface Sent {
  method?: string;
  cookie?: string;
  params?: Record<string, string>;
  headers?: Record<string, string>;
  body?: BodyInit;
}

async function send(handler: unknown, path: string, s: Sent = {}): Promise<Response> {
  const headers: Record<string, string> = { ...(s.headers ?? {}) };
  if (s.cookie) headers.cookie = s.cookie;
  const req = new Request(`${BASE}${path}`, { method: s.method ?? 'GET', headers, body: s.body });
  return (handler as Handler)(req, { params: Promise.resolve(s.params ?? {}) });
}

const json = (value: unknown): Pick<Sent, 'headers' | 'body'> => ({ headers: { 'content-type': 'application/json' }, body: JSON.stringify(value) });

/**
 * The one shape: JSON, not cached, `error` a sentence, `fields` (when present) field → messages,
 * and nothing else but the extra fields this kind of error names.
 */
async function expectShape(res: Response, status: number, opts: { fields?: boolean; extra?: string[] } = {}): Promise<Record<string, unknown>> {
  const text = await res.text();
  expect(res.status, text).toBe(status);
  expect(res.headers.get('content-type')).toMatch(/^application\/json/);
  expect(res.headers.get('cache-control')).toBe('no-store');
  const body = JSON.parse(text) as Record<string, unknown>;
  expect(typeof body.error).toBe('string');
  expect((body.error as string).length).toBeGreaterThan(5);
  const allowed = new Set(['error', 'fields', ...(opts.extra ?? [])]);
  expect(Object.keys(body).filter((k) => !allowed.has(k))).toEqual([]);
  if (opts.fields) {
    expect(body.fields).toBeTypeOf('object');
    for (const [key, messages] of Object.entries(body.fields as Record<string, unknown>)) {
      expect(key.length).toBeGreaterThan(0);
      expect(Array.isArray(messages) && messages.length > 0 && messages.every((m) => typeof m === 'string')).toBe(true);
    }
  } else {
    expect(body).not.toHaveProperty('fields');
  }
  for (const key of opts.extra ?? []) expect(body).toHaveProperty(key);
  return body;
}

let trainer: User;
let student: User;
let lead: User;
let trainerCookie: string;
let studentCookie: string;
let leadCookie: string;
let otherCohortId: string;
let cellId: string;

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  student = await demoUser('ada.lindqvist@kestrelvale.test');
  lead = await demoUser('lead@brennick.test');
  [trainerCookie, studentCookie, leadCookie] = await Promise.all([sessionCookie(trainer), sessionCookie(student), sessionCookie(lead)]);
  otherCohortId = (await otherTrainerWithCohort()).cohortId;
  const made = await send(cells.POST, '/api/cells', { method: 'POST', cookie: leadCookie, ...json({ name: `Error shape ${Date.now()}`, template: 'pick-and-place' }) });
  expect(made.status).toBe(201);
  cellId = ((await made.json()) as { cell: { id: string } }).cell.id;
});

afterAll(async () => {
  await closeDb();
});

describe('400: the request cannot be read', () => {
  it('a body that is not JSON', async () => {
    await expectShape(await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, headers: { 'content-type': 'application/json' }, body: '{"name": ' }), 400);
  });

  it('a query that does not fit names its parameters', async () => {
    const body = await expectShape(await send(adminUsers.GET, '/api/admin/users?page=zero', { cookie: await sessionCookie(await demoUser('admin@kestrelvale.test')) }), 400, { fields: true });
    expect(body.fields).toHaveProperty('page');
  });
});

describe('401, 403 and 404: who is asking, and for what', () => {
  it('401 without a session', async () => {
    await expectShape(await send(cells.GET, '/api/cells'), 401);
  });

  it('403 for a role the role table leaves out', async () => {
    await expectShape(await send(cohorts.GET, '/api/cohorts', { cookie: studentCookie }), 403);
  });

  it('403 for another owner’s record', async () => {
    await expectShape(await send(cohort.GET, `/api/cohorts/${otherCohortId}`, { cookie: trainerCookie, params: { id: otherCohortId } }), 403);
  });

  it('403 for a post from another site, naming the origin', async () => {
    const body = await expectShape(
      await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, headers: { 'content-type': 'application/json', origin: 'https://elsewhere.example' }, body: JSON.stringify({ name: 'x' }) }),
      403,
      { fields: true },
    );
    expect(body.fields).toEqual({ origin: ['https://elsewhere.example'] });
  });

  it('404 for a record that is not there (or not theirs to see)', async () => {
    const missing = '00000000-0000-4000-8000-000000000000';
    await expectShape(await send(cell.GET, `/api/cells/${missing}`, { cookie: leadCookie, params: { id: missing } }), 404);
    await expectShape(await send(cell.GET, `/api/cells/${cellId}`, { cookie: trainerCookie, params: { id: cellId } }), 404);
  });

  it('404 for a link that never was (the link-refusal mapping)', async () => {
    await expectShape(await send(accept.POST, '/api/invitations/accept', { method: 'POST', ...json({ token: 'x'.repeat(43), name: 'Nobody Here', password: 'a-long-enough-password' }) }), 404);
  });
});

describe('409: the state of things forbids it', () => {
  it('a duplicate name names its field', async () => {
    const name = `Shape cohort ${Date.now()}`;
    expect((await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, ...json({ name }) })).status).toBe(201);
    const body = await expectShape(await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, ...json({ name }) }), 409, { fields: true });
    expect(body.fields).toHaveProperty('name');
  });

  it('a save on a stale version carries latestVersion, and so does a CSV import on one', async () => {
    const latest = (await getVersion(cellId))!;
    const saved = await send(versions.POST, `/api/cells/${cellId}/versions`, { method: 'POST', cookie: leadCookie, params: { id: cellId }, ...json({ baseVersion: latest.version, document: latest.document }) });
    expect(saved.status).toBe(201);
    const stale = await expectShape(
      await send(versions.POST, `/api/cells/${cellId}/versions`, { method: 'POST', cookie: leadCookie, params: { id: cellId }, ...json({ baseVersion: latest.version, document: latest.document }) }),
      409,
      { extra: ['latestVersion'] },
    );
    expect(stale.latestVersion).toBe(latest.version + 1);
    const csvStale = await expectShape(
      await send(csv.POST, `/api/cells/${cellId}/csv/point-map`, { method: 'POST', cookie: leadCookie, params: { id: cellId, kind: 'point-map' }, ...json({ baseVersion: latest.version, csv: 'row_id\n' }) }),
      409,
      { extra: ['latestVersion'] },
    );
    expect(csvStale.latestVersion).toBe(latest.version + 1);
  });
});

describe('413, 415 and 422: the body does not fit', () => {
  it('413 for a JSON body past its cap', async () => {
    const body = await expectShape(await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, ...json({ name: 'x', description: 'y'.repeat(70 * 1024) }) }), 413, { fields: true });
    expect(body.fields).toHaveProperty('_');
  });

  it('415 for a body not sent as JSON', async () => {
    const body = await expectShape(await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, headers: { 'content-type': 'text/plain' }, body: '{"name":"x"}' }), 415, { fields: true });
    expect(body.fields).toHaveProperty('content-type');
  });

  it('422 naming the fields that do not fit', async () => {
    const body = await expectShape(await send(cohorts.POST, '/api/cohorts', { method: 'POST', cookie: trainerCookie, ...json({ name: '' }) }), 422, { fields: true });
    expect(body.fields).toHaveProperty('name');
  });

  it('422 for CSV rows carries rowErrors and problemCount beside the fields', async () => {
    const base = (await getVersion(cellId))!.version;
    const text = ['row_id,family,first_point,count,rack,slot,first_channel,bits,encoding,labels,invert', 'pm-bad,DO,1,7,x,2,0,,,,'].join('\n');
    const body = await expectShape(
      await send(csv.POST, `/api/cells/${cellId}/csv/point-map`, { method: 'POST', cookie: leadCookie, params: { id: cellId, kind: 'point-map' }, ...json({ baseVersion: base, csv: text }) }),
      422,
      { fields: true, extra: ['rowErrors', 'problemCount'] },
    );
    expect(body.problemCount).toBeGreaterThan(0);
    expect(Object.keys(body.fields as object).every((k) => k.startsWith('rows.'))).toBe(true);
  });

  describe('an upload names its field', () => {
    let drillId: string;
    let cookie: string;
    beforeAll(async () => {
      const w = await drillWorld(trainer, 0);
      drillId = w.drill.id;
      cookie = trainerCookie;
    });
    const upload = (bytes: Uint8Array<ArrayBuffer>, name: string, type: string) => {
      const form = new FormData();
      form.append('file', new Blob([bytes], { type }), name);
      return form;
    };

    it('413 past 1 MiB, on field `file`', async () => {
      const body = await expectShape(
        await send(assets.POST, `/api/drills/${drillId}/assets`, { method: 'POST', cookie, params: { id: drillId }, body: upload(new Uint8Array(1_048_577), 'big.png', 'image/png') }),
        413,
        { fields: true },
      );
      expect(body.fields).toHaveProperty('file');
    });

    it('415 for bytes that are not an image, whatever the name says', async () => {
      const body = await expectShape(
        await send(assets.POST, `/api/drills/${drillId}/assets`, { method: 'POST', cookie, params: { id: drillId }, body: upload(new TextEncoder().encode('not an image at all'), 'fake.png', 'image/png') }),
        415,
        { fields: true },
      );
      expect(body.fields).toHaveProperty('file');
    });

    it('400 for a body that is not multipart form data', async () => {
      await expectShape(await send(assets.POST, `/api/drills/${drillId}/assets`, { method: 'POST', cookie, params: { id: drillId }, headers: { 'content-type': 'text/plain' }, body: 'hello' }), 400);
    });
  });
});

describe('429 and 503: not now, with Retry-After', () => {
  it('429 for a batch ahead of what the run’s age allows', async () => {
    const started = await send(runs.POST, '/api/runs', { method: 'POST', cookie: leadCookie, ...json({ cellId, seed: 3 }) });
    expect(started.status).toBe(201);
    const runId = ((await started.json()) as { run: { id: string } }).run.id;
    const res = await send(batches.POST, `/api/runs/${runId}/batches`, { method: 'POST', cookie: leadCookie, params: { id: runId }, ...json({ key: 'shape-ahead-1', seq: 1, untilMs: 3_600_000, events: [] }) });
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
    const body = await expectShape(res, 429, { fields: true });
    expect(body.fields).toHaveProperty('untilMs');
  });

  it('503 when the server holds as many progress streams as it may', async () => {
    const w = await drillWorld(trainer, 0);
    // The job streams' count (lib/live/sse.ts streamCounter('jobs')), as if the process were full.
    const streams = streamCounter('jobs')();
    const before = streams.open;
    streams.open = 1_000_000;
    try {
      const res = await send(jobStream.GET, `/api/jobs/stream?subject=drill:${w.drill.id}`, { cookie: trainerCookie });
      expect(res.headers.get('retry-after')).toBe('5');
      await expectShape(res, 503);
    } finally {
      streams.open = before;
    }
  });
});

describe('500: anything unexpected', () => {
  it('is a bare sentence, with no stack or SQL', async () => {
    const failing = apiRoute(async () => {
      await db().raw('select * from no_such_table_for_the_error_shape_test');
      return Response.json({});
    });
    const quiet = console.error;
    console.error = () => undefined;
    try {
      const body = await expectShape(await send(failing, '/api/anything'), 500);
      expect(JSON.stringify(body)).not.toMatch(/no_such_table|select|at /);
    } finally {
      console.error = quiet;
    }
  });
});
