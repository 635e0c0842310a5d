/**
 * Files in object storage (issue #13, part 4) against the real S3 fake the integration setup
 * starts (s3rver on the tests' own port and bucket) and the real test database: brief images
 * stored in the bucket and served through their route's access checks; the migration that
 * moves images out of PostgreSQL (up, down and up again in a scratch schema); the printed
 * changeover report made by its job at sign-off and downloaded by the record's readers; run
 * archives exported and read back through the run's reader checks.
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { PDFDict, PDFDocument, PDFName } from 'pdf-lib';
import * as assets from '@/app/api/drills/[id]/assets/route';
import * as asset from '@/app/api/drills/[id]/assets/[assetId]/route';
import * as sign from '@/app/api/changeovers/[id]/sign/route';
import * as countersign from '@/app/api/changeovers/[id]/countersign/route';
import * as report from '@/app/api/changeovers/[id]/report/route';
import * as archive from '@/app/api/runs/[id]/archive/route';
import * as archiveOne from '@/app/api/runs/[id]/archive/[archiveId]/route';
import { closeDb, db } from '@/db/knex';
import { getVersion } from '@/db/cells';
import { createRun, insertBatch } from '@/db/runs';
import type { User } from '@/db/users';
import { DEMO_COUNTERSIGNER } from '@/db/seeds/demo-changeovers';
import { settleAfterResponse } from '@/lib/after-response';
import { makeChangeoverReport } from '@/lib/reports/changeover-report-job';
import { closeObjectStore } from '@/lib/storage/object-store';
import type { SignedRecord } from '@/lib/changeovers/types';
import { BASE, call, demoUser, makeUser, sessionCookie } from './helpers';
import { TEST_ENV } from './test-env';
import { closeScratchSchema, openScratchSchema } from './scratch-schema';
import { drillWorld, expectNoSecrets, HIDDEN_FAULTS, type DrillWorld } from './drills-fixtures';
import { ROBOT_GUARD_BOTH_DOORS, YELLOW_ON_OPEN_GUARD, acceptViolations, draftingChangeover, pinAndProve } from './changeovers-fixtures';

// A client of its own, so what the tests see in the bucket does not go through lib/storage.
const s3 = new S3Client({
  endpoint: TEST_ENV.S3_ENDPOINT,
  region: TEST_ENV.S3_REGION,
  credentials: { accessKeyId: TEST_ENV.S3_ACCESS_KEY_ID, secretAccessKey: TEST_ENV.S3_SECRET_ACCESS_KEY },
  forcePathStyle: true,
  requestChecksumCalculation: 'WHEN_REQUIRED',
  responseChecksumValidation: 'WHEN_REQUIRED',
});
const Bucket = TEST_ENV.S3_BUCKET;

async function objectBytes(Key: string): Promise<Buffer> {
  const out = await s3.send(new GetObjectCommand({ Bucket, Key }));
  return Buffer.from(await out.Body!.transformToByteArray());
}
const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

// The smallest valid PNG, by its published signature (as drills.test.ts uses).
const PNG_1x1 = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d4944415478da63f8ffff3f0005fe02fea7d6a1bb0000000049454e44ae426082', 'hex');

let world: DrillWorld;
let trainer: User;
const cookies = new Map<string, string>();
const cookieOf = async (u: User) => {
  if (!cookies.has(u.id)) cookies.set(u.id, await sessionCookie(u));
  return cookies.get(u.id)!;
};

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  world = await drillWorld(trainer, 2);
});

afterAll(async () => {
  s3.destroy();
  closeObjectStore();
  await closeDb();
});

async function getRaw(handler: unknown, path: string, params: Record<string, string>, user: User | null): Promise<Response> {
  const headers: Record<string, string> = user ? { cookie: await cookieOf(user) } : {};
  return (handler as (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>)(new Request(`${BASE}${path}`, { headers }), {
    params: Promise.resolve(params),
  });
}

describe('brief images in the bucket', () => {
  it('an upload lands in the bucket under its key with its SHA-256; the route serves it to the drill’s readers only', async () => {
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(PNG_1x1)], { type: 'image/png' }), 'panel.png');
    const res = await assets.POST(new Request(`${BASE}/api/drills/${world.drill.id}/assets`, { method: 'POST', headers: { cookie: await cookieOf(trainer) }, body: form }), {
      params: Promise.resolve({ id: world.drill.id }),
    });
    expect(res.status).toBe(201);
    const id = ((await res.json()) as { asset: { id: string } }).asset.id;

    const row = await db()('drill_assets').where({ id }).first();
    expect(row.object_key).toBe(`drill-assets/${world.drill.id}/${id}`);
    expect(row.sha256).toBe(sha256(PNG_1x1));
    expect(row).not.toHaveProperty('bytes');
    const head = await s3.send(new HeadObjectCommand({ Bucket, Key: row.object_key }));
    expect(head.ContentType).toBe('image/png');
    expect((await objectBytes(row.object_key)).equals(PNG_1x1)).toBe(true);

    const path = `/api/drills/${world.drill.id}/assets/${id}`;
    const params = { id: world.drill.id, assetId: id };
    const got = await getRaw(asset.GET, path, params, trainer);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('image/png');
    expect(got.headers.get('cache-control')).toMatch(/^private/);
    expect(Buffer.from(await got.arrayBuffer()).equals(PNG_1x1)).toBe(true);
    // A student of the assigned cohort (open assignment) reads it; one of another cohort gets 404, nobody signed in 401.
    expect((await getRaw(asset.GET, path, params, world.students[0])).status).toBe(200);
    const outsider = await makeUser('student');
    expect((await getRaw(asset.GET, path, params, outsider)).status).toBe(404);
    expect((await getRaw(asset.GET, path, params, null)).status).toBe(401);
  });

  it('an object changed behind the app’s back is never served (its SHA-256 no longer matches)', async () => {
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(PNG_1x1)], { type: 'image/png' }), 'tampered.png');
    const res = await assets.POST(new Request(`${BASE}/api/drills/${world.drill.id}/assets`, { method: 'POST', headers: { cookie: await cookieOf(trainer) }, body: form }), {
      params: Promise.resolve({ id: world.drill.id }),
    });
    const id = ((await res.json()) as { asset: { id: string } }).asset.id;
    const row = await db()('drill_assets').where({ id }).first();
    await s3.send(new PutObjectCommand({ Bucket, Key: row.object_key, Body: Buffer.from('not the image'), ContentType: 'image/png' }));
    const got = await getRaw(asset.GET, `/api/drills/${world.drill.id}/assets/${id}`, { id: world.drill.id, assetId: id }, trainer);
    expect(got.status).toBe(500);
    expect(await got.text()).not.toContain('not the image');
  });
});

describe('the migration that moved images out of PostgreSQL', () => {
  const SCHEMA = 'object_storage_migration';
  const MIGRATION = '20261204_801_object_storage';
  let knex: Knex;

  beforeAll(async () => {
    knex = await openScratchSchema(SCHEMA);
  });

  afterAll(() => closeScratchSchema(knex, SCHEMA));

  it('moves bytea images to the bucket, comes back down with the same bytes, and runs again', async () => {
    await knex.migrate.latest();
    // Step back to the schema before the move, where images were bytes in the row.
    const [, downNames] = await knex.migrate.down();
    expect(downNames).toEqual([MIGRATION]);
    expect(await knex.schema.hasColumn('drill_assets', 'bytes')).toBe(true);

    const [user] = await knex('users').insert({ email: 'mover@example.test', name: 'Mover', password_hash: 'x', role: 'trainer' }).returning('id');
    const [cell] = await knex('cells').insert({ owner_id: user.id, name: 'Mover cell' }).returning('id');
    const [drill] = await knex('drills')
      .insert({ trainer_id: user.id, title: 'Mover drill', cell_id: cell.id, cell_version: 1, answer_kind: 'open-wire', answer_location: 'w-1', time_limit_ms: 60_000, permissions: '{}' })
      .returning('id');
    const images = [PNG_1x1, Buffer.concat([PNG_1x1, Buffer.alloc(40_000, 9)])];
    const rows = await knex('drill_assets')
      .insert(images.map((bytes, i) => ({ drill_id: drill.id, name: `old-${i}.png`, media_type: 'image/png', size_bytes: bytes.length, bytes, uploaded_by: user.id })))
      .returning('id');

    const [, upNames] = await knex.migrate.up();
    expect(upNames).toEqual([MIGRATION]);
    expect(await knex.schema.hasColumn('drill_assets', 'bytes')).toBe(false);
    for (const [i, { id }] of rows.entries()) {
      const row = await knex('drill_assets').where({ id }).first();
      expect(row.object_key).toBe(`drill-assets/${drill.id}/${id}`);
      expect(row.sha256).toBe(sha256(images[i]));
      expect(row.size_bytes).toBe(images[i].length);
      expect((await objectBytes(row.object_key)).equals(images[i])).toBe(true);
    }

    // Down puts the bytes back from the bucket; up again moves them again to the same keys.
    await knex.migrate.down();
    for (const [i, { id }] of rows.entries()) expect(((await knex('drill_assets').where({ id }).first()).bytes as Buffer).equals(images[i])).toBe(true);
    await knex.migrate.up();
    const again = await knex('drill_assets').whereIn('id', rows.map((r) => r.id)).orderBy('name').select('object_key', 'sha256');
    expect(again.map((r) => r.sha256)).toEqual(images.map(sha256));
  });
});

describe('the printed changeover report', () => {
  it('is made by its job after the countersignature and downloaded by the record’s readers as a PDF', async () => {
    const lead = await demoUser('lead@brennick.test');
    const shiftLead = await demoUser(DEMO_COUNTERSIGNER.email);
    const admin = await demoUser('admin@kestrelvale.test');
    const otherLead = await makeUser('lead');
    const student = await demoUser('ada.lindqvist@kestrelvale.test');
    const { id, cellId } = await draftingChangeover(lead.id, { countersignerId: shiftLead.id, title: 'Coded guard switch — Łódź line' });
    await acceptViolations(id, lead.id, await pinAndProve(id, cellId, lead.id, [YELLOW_ON_OPEN_GUARD, ROBOT_GUARD_BOTH_DOORS]));
    const path = `/api/changeovers/${id}/report`;
    const signature = (u: User) => ({ baseVersion: 1, proposedVersion: 2, confirmName: u.name });

    // No report before sign-off.
    expect((await getRaw(report.GET, path, { id }, lead)).status).toBe(404);

    expect((await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: await cookieOf(lead), params: { id }, body: signature(lead) })).status).toBe(200);
    const cs = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: await cookieOf(shiftLead), params: { id }, body: signature(shiftLead) });
    expect(cs.status).toBe(201);
    const record = (cs.body as { record: SignedRecord }).record;
    await settleAfterResponse();

    // The countersignature queued the job; until it has run, the download says to come back.
    const jobs = await db()('jobs').where({ subject: `changeover:${id}`, kind: 'changeover-report' }).select('state');
    expect(jobs).toEqual([{ state: 'queued' }]);
    const early = await getRaw(report.GET, path, { id }, lead);
    expect(early.status).toBe(503);
    expect(early.headers.get('retry-after')).toBe('5');
    // Asking again does not queue a second job while one waits.
    expect((await db()('jobs').where({ subject: `changeover:${id}`, kind: 'changeover-report' })).length).toBe(1);

    // What the worker runs (lib/reports/changeover-report-job.ts).
    const made = await makeChangeoverReport(id);
    expect(made.made).toBe(true);
    expect(made.objectKey).toBe(`changeover-reports/${id}.pdf`);
    const stored = await objectBytes(made.objectKey);
    expect(sha256(stored)).toBe(made.sha256);
    // Running it again finds the report and leaves it alone.
    expect((await makeChangeoverReport(id)).made).toBe(false);

    const got = await getRaw(report.GET, path, { id }, lead);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('application/pdf');
    expect(got.headers.get('content-disposition')).toMatch(/^attachment; filename="changeover-[\w-]+-v1-v2-\d{4}-\d{2}-\d{2}\.pdf"$/);
    expect(got.headers.get('cache-control')).toMatch(/^private/);
    const bytes = Buffer.from(await got.arrayBuffer());
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(bytes.equals(stored)).toBe(true);
    const pdf = await PDFDocument.load(bytes);
    expect(pdf.getPageCount()).toBeGreaterThanOrEqual(1);
    expect(pdf.getTitle()).toBe(`Changeover record: ${record.title}`);
    // The text is set in embedded Inter subsets (fonts.ts); the title's "Łódź", outside WinAnsi,
    // took the Latin Extended bold face, which the first page's fonts show.
    const resources = pdf.getPage(0).node.Resources()!.lookup(PDFName.of('Font'), PDFDict);
    const pageFonts = resources.values().map((ref) => String(pdf.context.lookup(ref, PDFDict).get(PDFName.of('BaseFont'))));
    expect(pageFonts).toEqual(expect.arrayContaining(['/CWLARX+Inter-Regular', '/CWLABX+Inter-Bold', '/CWLEBX+Inter-Bold']));

    // The record's readers: the admin too; another lead 404, a student 403, nobody signed in 401.
    expect((await getRaw(report.GET, path, { id }, admin)).status).toBe(200);
    expect((await getRaw(report.GET, path, { id }, otherLead)).status).toBe(404);
    expect((await getRaw(report.GET, path, { id }, student)).status).toBe(403);
    expect((await getRaw(report.GET, path, { id }, null)).status).toBe(401);
  });
});

describe('run archives', () => {
  type ArchiveAnswer = { archive: { id: string; sha256: string; sizeBytes: number; hiddenIncluded: boolean; url: string } };

  it('exports what the reader may see to the bucket and serves it back through the run’s reader checks', async () => {
    const student = world.students[1];
    const run = await createRun({ userId: student.id, mode: 'drill', drillId: world.drill.id, assignmentId: world.assignmentId, cellId: world.cellId, cellVersion: 1, seed: 4242 });
    const events = [
      { t: 100, event: { type: 'press' as const, device: 'start' } },
      { t: 400, event: { type: 'inject-fault' as const, fault: HIDDEN_FAULTS[0] } },
      { t: 900, event: { type: 'release' as const, device: 'start' } },
    ];
    expect(await insertBatch(run.id, { seq: 1, key: 'archive-1', untilMs: 1000, events })).toEqual({ ok: true });
    const path = `/api/runs/${run.id}/archive`;

    const mine = await call(archive.POST, path, { method: 'POST', cookie: await cookieOf(student), params: { id: run.id } });
    expect(mine.status, JSON.stringify(mine.body)).toBe(201);
    const a = (mine.body as ArchiveAnswer).archive;
    expect(a.hiddenIncluded).toBe(false);
    expect(a.url).toBe(`${path}/${a.id}`);
    const key = `run-archives/${run.id}/${a.sha256}.json`;
    expect(sha256(await objectBytes(key))).toBe(a.sha256);
    // The same content exported again is the same archive.
    const again = await call(archive.POST, path, { method: 'POST', cookie: await cookieOf(student), params: { id: run.id } });
    expect((again.body as ArchiveAnswer).archive.id).toBe(a.id);

    const got = await getRaw(archiveOne.GET, a.url, { id: run.id, archiveId: a.id }, student);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('application/json');
    const text = await got.text();
    expect(sha256(Buffer.from(text, 'utf8'))).toBe(a.sha256);
    const file = JSON.parse(text);
    expect(file).toMatchObject({ format: 'cellwright-run-archive', version: 1, hiddenIncluded: false, run: { id: run.id, userId: student.id, status: 'active' } });
    expect(file.cell).toEqual({ id: world.cellId, version: 1, document: (await getVersion(world.cellId, 1))!.document });
    // While the drill is open the student's copy has no fault events, cards, rules or seed.
    expect(file.log.events).toEqual([events[0], events[2]]);
    expect(file.run).not.toHaveProperty('seed');
    expectNoSecrets(file, (t, needle) => expect(t).not.toContain(needle));

    // The drill's trainer exports the full view (fault events, cards, seed).
    const full = await call(archive.POST, path, { method: 'POST', cookie: await cookieOf(trainer), params: { id: run.id } });
    const t = (full.body as ArchiveAnswer).archive;
    expect(t.hiddenIncluded).toBe(true);
    const trainerCopy = JSON.parse(await (await getRaw(archiveOne.GET, t.url, { id: run.id, archiveId: t.id }, trainer)).text());
    expect(trainerCopy.log.events).toEqual(events);
    expect(trainerCopy.run.seed).toBe(4242);
    expect(trainerCopy.drill.faults).toEqual(HIDDEN_FAULTS);

    // The student never gets the trainer's copy; the trainer may read the student's.
    expect((await getRaw(archiveOne.GET, t.url, { id: run.id, archiveId: t.id }, student)).status).toBe(404);
    expect((await getRaw(archiveOne.GET, a.url, { id: run.id, archiveId: a.id }, trainer)).status).toBe(200);
    // Someone who may not read the run: 404 for both routes; nobody signed in: 401.
    const outsider = await makeUser('student');
    expect((await call(archive.POST, path, { method: 'POST', cookie: await cookieOf(outsider), params: { id: run.id } })).status).toBe(404);
    expect((await getRaw(archiveOne.GET, a.url, { id: run.id, archiveId: a.id }, outsider)).status).toBe(404);
    expect((await getRaw(archiveOne.GET, a.url, { id: run.id, archiveId: a.id }, null)).status).toBe(401);
  });
});
