/**
 * Drills: authoring checked by the engine, brief images (size and type sniffed), assignment
 * with e-mail through the real SMTP catcher, and what a student may and may not receive.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as drills from '@/app/api/drills/route';
import * as drillOne from '@/app/api/drills/[id]/route';
import * as preview from '@/app/api/drills/[id]/preview/route';
import * as assets from '@/app/api/drills/[id]/assets/route';
import * as asset from '@/app/api/drills/[id]/assets/[assetId]/route';
import * as assignRoute from '@/app/api/drills/[id]/assignments/route';
import * as myAssignments from '@/app/api/assignments/route';
import * as assignmentOne from '@/app/api/assignments/[id]/route';
import { closeDb, db } from '@/db/knex';
import type { User } from '@/db/users';
import { createCohort } from '@/db/cohorts';
import { BASE, call, demoUser, latestMailTo, makeUser, sessionCookie, uniqueEmail } from './helpers';
import { drillBody, drillWorld, expectNoSecrets, type DrillWorld } from './drills-fixtures';

let trainer: User;
let trainerCookie: string;
let world: DrillWorld;

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  trainerCookie = await sessionCookie(trainer);
  world = await drillWorld(trainer, 2);
});
afterAll(async () => {
  await closeDb();
});

const drillCount = async () => Number((await db()('drills').count<{ n: string }[]>({ n: '*' }).first())?.n ?? 0);
const assetCount = async () => Number((await db()('drill_assets').count<{ n: string }[]>({ n: '*' }).first())?.n ?? 0);

describe('authoring', () => {
  it('creates a drill whose fault cards and rules fit the base cell', async () => {
    const res = await call(drills.POST, '/api/drills', { method: 'POST', cookie: trainerCookie, body: drillBody(world.cellId, { title: 'Created by test' }) });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect((res.body as { drill: { faults: unknown[] } }).drill.faults).toHaveLength(2);
  });

  it('rejects an unknown fault card kind with 422 naming the path, and stores nothing', async () => {
    const before = await drillCount();
    const body = drillBody(world.cellId);
    body.faults = [{ id: 'x1', kind: 'gremlins', row: 'w-stop' } as never];
    const res = await call(drills.POST, '/api/drills', { method: 'POST', cookie: trainerCookie, body });
    expect(res.status).toBe(422);
    expect(Object.keys((res.body as { fields: Record<string, string[]> }).fields)).toContain('faults.0.kind');
    expect(await drillCount()).toBe(before);
  });

  it('rejects a fault card on a row the cell does not have, and a rule on an unknown signal, naming the paths', async () => {
    const body = drillBody(world.cellId);
    body.faults = [{ id: 'x1', kind: 'open-wire', row: 'w-nowhere' }];
    body.rules = [{ weight: 1, rule: { id: 'r', kind: 'never', p: { signal: 'no.such.signal', op: '==', value: 1 } } }] as never;
    const res = await call(drills.POST, '/api/drills', { method: 'POST', cookie: trainerCookie, body });
    expect(res.status).toBe(422);
    expect(Object.keys((res.body as { fields: Record<string, string[]> }).fields)).toContain('faults.0.row');
  });

  it('rejects a base cell that is not the trainer\'s own', async () => {
    const other = await makeUser('trainer');
    const res = await call(drills.POST, '/api/drills', { method: 'POST', cookie: await sessionCookie(other), body: drillBody(world.cellId) });
    expect(res.status).toBe(422);
    expect((res.body as { fields: Record<string, string[]> }).fields.cellId).toBeDefined();
  });

  it('another trainer cannot read the drill (404); a student gets 403', async () => {
    const other = await makeUser('trainer');
    const p = { params: { id: world.drill.id } };
    expect((await call(drillOne.GET, `/api/drills/${world.drill.id}`, { ...p, cookie: await sessionCookie(other) })).status).toBe(404);
    expect((await call(drillOne.GET, `/api/drills/${world.drill.id}`, { ...p, cookie: await sessionCookie(world.students[0]) })).status).toBe(403);
    expect((await call(preview.GET, `/api/drills/${world.drill.id}/preview`, { ...p, cookie: await sessionCookie(world.students[0]) })).status).toBe(403);
  });

  it('the trainer preview has the whole drill and the base document', async () => {
    const res = await call(preview.GET, `/api/drills/${world.drill.id}/preview`, { params: { id: world.drill.id }, cookie: trainerCookie });
    expect(res.status).toBe(200);
    const body = res.body as { drill: { faults: { id: string }[]; answer: unknown }; document: { id: string } };
    expect(body.drill.faults.map((f) => f.id)).toEqual(['hiddenStopBreak', 'hiddenPartMismatch']);
    expect(body.drill.answer).toEqual({ kind: 'open-wire', location: 'w-stop' });
    expect(body.document.id).toBe('kestrel-vale-cell-b');
  });

  it('updates a drill without runs and freezes it once a run exists (409)', async () => {
    const w = await drillWorld(trainer, 1);
    const p = { params: { id: w.drill.id }, cookie: trainerCookie, method: 'PATCH' };
    const ok = await call(drillOne.PATCH, `/api/drills/${w.drill.id}`, { ...p, body: { title: 'Renamed drill' } });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const { startAssignmentRun } = await import('@/db/runs');
    await startAssignmentRun({ userId: w.students[0].id, mode: 'drill', drillId: w.drill.id, assignmentId: w.assignmentId, cellId: w.cellId, cellVersion: 1, seed: 1 });
    const frozen = await call(drillOne.PATCH, `/api/drills/${w.drill.id}`, { ...p, body: { title: 'Again' } });
    expect(frozen.status).toBe(409);
  });
});

// Smallest valid files of each type, by their published signatures.
const PNG_1x1 = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d4944415478da63f8ffff3f0005fe02fea7d6a1bb0000000049454e44ae426082', 'hex');
const GIF_HEADER = Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'latin1');

async function upload(drillId: string, bytes: Buffer, name: string, type: string, cookie = trainerCookie) {
  const form = new FormData();
  form.append('file', new Blob([new Uint8Array(bytes)], { type }), name);
  const req = new Request(`${BASE}/api/drills/${drillId}/assets`, { method: 'POST', headers: { cookie }, body: form });
  const res = await assets.POST(req, { params: Promise.resolve({ id: drillId }) });
  return { status: res.status, body: await res.json() };
}

describe('brief images', () => {
  it('stores a PNG with the type sniffed from its bytes (even when the client says otherwise) and serves it with nosniff', async () => {
    const res = await upload(world.drill.id, PNG_1x1, 'wiring.png', 'text/plain');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.asset.mediaType).toBe('image/png');
    const got = await asset.GET(new Request(`${BASE}/api/drills/${world.drill.id}/assets/${res.body.asset.id}`, { headers: { cookie: trainerCookie } }), {
      params: Promise.resolve({ id: world.drill.id, assetId: res.body.asset.id }),
    });
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('image/png');
    expect(got.headers.get('x-content-type-options')).toBe('nosniff');
    expect(Buffer.from(await got.arrayBuffer()).equals(PNG_1x1)).toBe(true);
    const gif = await upload(world.drill.id, GIF_HEADER, 'diagram.gif', 'image/gif');
    expect(gif.body.asset?.mediaType).toBe('image/gif');
  });

  it('refuses a file that is not an image (415) even when it claims to be one, and stores nothing', async () => {
    const before = await assetCount();
    const res = await upload(world.drill.id, Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"></svg>'), 'evil.png', 'image/png');
    expect(res.status).toBe(415);
    expect(res.body.error).toBeTruthy();
    expect(await assetCount()).toBe(before);
  });

  it('refuses an image over 1 MiB (413) and stores nothing', async () => {
    const before = await assetCount();
    const big = Buffer.concat([PNG_1x1, Buffer.alloc(1_048_577)]);
    const res = await upload(world.drill.id, big, 'huge.png', 'image/png');
    expect(res.status).toBe(413);
    expect(await assetCount()).toBe(before);
  });

  it('an assigned student may read a brief image; an unrelated student may not (404)', async () => {
    const up = await upload(world.drill.id, PNG_1x1, 'for-students.png', 'image/png');
    const get = async (u: User) =>
      (
        await asset.GET(new Request(`${BASE}/api/drills/${world.drill.id}/assets/${up.body.asset.id}`, { headers: { cookie: await sessionCookie(u) } }), {
          params: Promise.resolve({ id: world.drill.id, assetId: up.body.asset.id }),
        })
      ).status;
    expect(await get(world.students[0])).toBe(200);
    expect(await get(await makeUser('student'))).toBe(404);
  });
});

describe('assignment', () => {
  it('assigns to a cohort, e-mails each student a link through the SMTP catcher', async () => {
    const cohort = await createCohort(trainer.id, { name: `Mail cohort ${uniqueEmail('m')}`, description: '' });
    if (!cohort.ok) throw new Error('cohort');
    const s = await makeUser('student');
    await db()('memberships').insert({ cohort_id: cohort.cohort.id, user_id: s.id });
    const res = await call(assignRoute.POST, `/api/drills/${world.drill.id}/assignments`, {
      method: 'POST',
      cookie: trainerCookie,
      params: { id: world.drill.id },
      body: { cohortId: cohort.cohort.id, opensAt: new Date(Date.now() - 60_000).toISOString(), closesAt: new Date(Date.now() + 86_400_000).toISOString() },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const body = res.body as { assignment: { id: string }; mailed: number };
    expect(body.mailed).toBe(1);
    const mail = await latestMailTo(s.email);
    expect(mail.subject).toContain('Integration drill');
    expect(mail.text_body).toContain(`${BASE}/drills/assignments/${body.assignment.id}`);
    expectNoSecrets(mail, (text, needle) => expect(text).not.toContain(needle));
  });

  it('refuses another trainer\'s cohort (403) and close before open (422)', async () => {
    const other = await makeUser('trainer');
    const oc = await createCohort(other.id, { name: `Other ${uniqueEmail('o')}`, description: '' });
    if (!oc.ok) throw new Error('cohort');
    const now = Date.now();
    const p = { method: 'POST', cookie: trainerCookie, params: { id: world.drill.id } };
    const foreign = await call(assignRoute.POST, '/x', { ...p, body: { cohortId: oc.cohort.id, opensAt: new Date(now).toISOString(), closesAt: new Date(now + 1000).toISOString() } });
    expect(foreign.status).toBe(403);
    const backwards = await call(assignRoute.POST, '/x', { ...p, body: { cohortId: world.cohortId, opensAt: new Date(now).toISOString(), closesAt: new Date(now - 1000).toISOString() } });
    expect(backwards.status).toBe(422);
  });
});

describe('what a student receives', () => {
  it('lists the assignment as open, and the drill payload has no fault cards, rules or answer', async () => {
    const cookie = await sessionCookie(world.students[0]);
    const list = await call(myAssignments.GET, '/api/assignments', { cookie });
    expect(list.status).toBe(200);
    const mine = (list.body as { assignments: { id: string; state: string }[] }).assignments.find((a) => a.id === world.assignmentId);
    expect(mine?.state).toBe('open');
    const res = await call(assignmentOne.GET, `/api/assignments/${world.assignmentId}`, { cookie, params: { id: world.assignmentId } });
    expect(res.status).toBe(200);
    const body = res.body as { drill: Record<string, unknown>; document: unknown };
    expect(body.drill.title).toBe('Integration drill');
    expect(body.drill).not.toHaveProperty('faults');
    expect(body.drill).not.toHaveProperty('rules');
    expect(body.drill).not.toHaveProperty('answer');
    expect(body.document).toBeTruthy();
    expectNoSecrets(res.body, (text, needle) => expect(text, needle).not.toContain(needle));
    expectNoSecrets(list.body, (text, needle) => expect(text, needle).not.toContain(needle));
  });

  it('a student outside the cohort gets 404; trainers get 403', async () => {
    const outsider = await makeUser('student');
    expect((await call(assignmentOne.GET, '/x', { cookie: await sessionCookie(outsider), params: { id: world.assignmentId } })).status).toBe(404);
    expect((await call(assignmentOne.GET, '/x', { cookie: trainerCookie, params: { id: world.assignmentId } })).status).toBe(403);
  });

  it('a student cannot list or read drills (403)', async () => {
    const cookie = await sessionCookie(world.students[0]);
    expect((await call(drills.GET, '/api/drills', { cookie })).status).toBe(403);
  });
});
