/**
 * Changeovers against the real test database: who may open, list and read them; pinning; the
 * sign-off rules (two different people, evidence ready, the typed name, the pin the signer saw);
 * the signed record's immutability in the database itself; rollback and abandoning; the diff
 * and the I/O change sheet; the demo changeover.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import * as changeovers from '@/app/api/changeovers/route';
import * as one from '@/app/api/changeovers/[id]/route';
import * as pin from '@/app/api/changeovers/[id]/pin/route';
import * as diffRoute from '@/app/api/changeovers/[id]/diff/route';
import * as ioSheet from '@/app/api/changeovers/[id]/io-sheet/route';
import * as sign from '@/app/api/changeovers/[id]/sign/route';
import * as countersign from '@/app/api/changeovers/[id]/countersign/route';
import * as rollback from '@/app/api/changeovers/[id]/rollback/route';
import * as recordRoute from '@/app/api/changeovers/[id]/record/route';
import { closeDb, db } from '@/db/knex';
import { getVersion, saveVersion } from '@/db/cells';
import type { User } from '@/db/users';
import { DEMO_CELL_NAMES } from '@/db/seeds/demo-cells';
import { DEMO_CHANGEOVER, DEMO_COUNTERSIGNER } from '@/db/seeds/demo-changeovers';
import { documentSha256 } from '@/lib/changeovers/hash';
import type { Changeover, SignedRecord } from '@/lib/changeovers/types';
import { call, demoUser, makeUser, sessionCookie } from './helpers';
import { ROBOT_GUARD_BOTH_DOORS, YELLOW_ON_OPEN_GUARD, acceptViolations, baseDocument, cellWithProposal, draftingChangeover, pinAndProve } from './changeovers-fixtures';

type Json = Record<string, unknown>;
let lead: User;
let trainer: User;
let admin: User;
let student: User;
let otherLead: User;
let shiftLead: User;
const cookie = new Map<string, string>();
const as = (u: User) => cookie.get(u.id)!;
const at = (id: string) => ({ id });

beforeAll(async () => {
  lead = await demoUser('lead@brennick.test');
  trainer = await demoUser('trainer@kestrelvale.test');
  admin = await demoUser('admin@kestrelvale.test');
  student = await demoUser('ada.lindqvist@kestrelvale.test');
  shiftLead = await demoUser(DEMO_COUNTERSIGNER.email);
  otherLead = await makeUser('lead');
  for (const u of [lead, trainer, admin, student, otherLead, shiftLead]) cookie.set(u.id, await sessionCookie(u));
});

afterAll(async () => {
  await closeDb();
});

const read = (u: User, id: string) => call(one.GET, `/api/changeovers/${id}`, { cookie: as(u), params: at(id) });
const list = async (u: User) => {
  const r = await call(changeovers.GET, '/api/changeovers', { cookie: as(u) });
  return { status: r.status, ids: r.status === 200 ? ((r.body as { changeovers: Changeover[] }).changeovers.map((c) => c.id)) : [] };
};
const signature = (u: User, proposedVersion = 2, extra: Json = {}) => ({ baseVersion: 1, proposedVersion, confirmName: u.name, ...extra });

describe('opening, listing and reading', () => {
  it('a lead opens a changeover on their own cell; the base is the latest version unless named', async () => {
    const cellId = await cellWithProposal(lead.id);
    const r = await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(lead), body: { cellId, title: ' Second guard door ', description: 'Why' } });
    expect(r.status).toBe(201);
    const co = (r.body as { changeover: Changeover }).changeover;
    expect(co).toMatchObject({ title: 'Second guard door', baseVersion: 2, state: 'drafting', pinnedVersion: null, openedBy: { id: lead.id } });

    const named = await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(lead), body: { cellId, title: 'From v1', baseVersion: 1 } });
    expect((named.body as { changeover: Changeover }).changeover).toMatchObject({ baseVersion: 1, proposedVersion: 2 });

    const missing = await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(lead), body: { cellId, title: 'Too far', baseVersion: 9 } });
    expect(missing.status).toBe(422);
    expect((missing.body as { fields: Json }).fields).toHaveProperty('baseVersion');
  });

  it('refuses a cell that is not the opener’s own (422) and a role without changeovers (403)', async () => {
    const trainersCell = await cellWithProposal(trainer.id);
    const r = await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(lead), body: { cellId: trainersCell, title: 'Not mine' } });
    expect(r.status).toBe(422);
    expect((r.body as { fields: Json }).fields).toHaveProperty('cellId');
    const bad = await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(lead), body: { cellId: trainersCell, title: '' } });
    expect(bad.status).toBe(422);
    expect((await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(student), body: { cellId: trainersCell, title: 'x' } })).status).toBe(403);
    expect((await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(admin), body: { cellId: trainersCell, title: 'x' } })).status).toBe(403);
  });

  it('the opener and the admin read it; another lead gets 404 and a student 403', async () => {
    const { id } = await draftingChangeover(lead.id);
    expect((await read(lead, id)).status).toBe(200);
    const byAdmin = await read(admin, id);
    expect(byAdmin.status).toBe(200);
    expect((byAdmin.body as { abilities: Json }).abilities).toEqual({ edit: false, countersign: true });
    expect((await read(otherLead, id)).status).toBe(404);
    expect((await read(trainer, id)).status).toBe(404);
    expect((await read(student, id)).status).toBe(403);
    expect((await call(one.GET, '/api/changeovers/not-a-uuid', { cookie: as(lead), params: at('not-a-uuid') })).status).toBe(404);

    expect((await list(lead)).ids).toContain(id);
    expect((await list(admin)).ids).toContain(id);
    expect((await list(otherLead)).ids).not.toContain(id);
    expect((await list(student)).status).toBe(403);
  });

  it('a trainer opens changeovers on their own cells for teaching, and reads them', async () => {
    const cellId = await cellWithProposal(trainer.id);
    const r = await call(changeovers.POST, '/api/changeovers', { method: 'POST', cookie: as(trainer), body: { cellId, title: 'Class example' } });
    expect(r.status).toBe(201);
    const id = (r.body as { changeover: Changeover }).changeover.id;
    expect((await read(trainer, id)).status).toBe(200);
    expect((await list(trainer)).ids).toContain(id);
    expect((await read(lead, id)).status).toBe(404);
  });

  it('the person asked to countersign may read it; naming yourself or a student is refused', async () => {
    const { id } = await draftingChangeover(lead.id);
    const self = await call(one.PATCH, `/api/changeovers/${id}`, { method: 'PATCH', cookie: as(lead), params: at(id), body: { countersignerId: lead.id } });
    expect(self.status).toBe(422);
    const stu = await call(one.PATCH, `/api/changeovers/${id}`, { method: 'PATCH', cookie: as(lead), params: at(id), body: { countersignerId: student.id } });
    expect(stu.status).toBe(422);
    const ok = await call(one.PATCH, `/api/changeovers/${id}`, { method: 'PATCH', cookie: as(lead), params: at(id), body: { countersignerId: otherLead.id } });
    expect(ok.status).toBe(200);
    expect((await read(otherLead, id)).status).toBe(200);
    expect((await list(otherLead)).ids).toContain(id);
    // They read, but do not change it.
    expect((await call(one.PATCH, `/api/changeovers/${id}`, { method: 'PATCH', cookie: as(otherLead), params: at(id), body: { title: 'Mine now' } })).status).toBe(403);
  });
});

describe('pinning', () => {
  it('pins the latest version, keeps it while the cell moves on, and follows the latest again when unpinned', async () => {
    const { id, cellId } = await draftingChangeover(lead.id);
    const pinned = await call(pin.POST, `/api/changeovers/${id}/pin`, { method: 'POST', cookie: as(lead), params: at(id) });
    expect(pinned.status).toBe(200);
    expect((pinned.body as { changeover: Changeover }).changeover).toMatchObject({ state: 'checked', pinnedVersion: 2, proposedVersion: 2 });

    const latest = await getVersion(cellId);
    const saved = await saveVersion(cellId, lead.id, 2, { ...latest!.document, description: 'a later edit' }, 'later');
    expect(saved.ok).toBe(true);
    const after = (await read(lead, id)).body as { changeover: Changeover };
    expect(after.changeover).toMatchObject({ pinnedVersion: 2, proposedVersion: 2, latestVersion: 3 });
    // Pinning again answers the pin it has.
    expect(((await call(pin.POST, `/api/changeovers/${id}/pin`, { method: 'POST', cookie: as(lead), params: at(id) })).body as { changeover: Changeover }).changeover.pinnedVersion).toBe(2);

    const unpinned = await call(pin.DELETE, `/api/changeovers/${id}/pin`, { method: 'DELETE', cookie: as(lead), params: at(id) });
    expect((unpinned.body as { changeover: Changeover }).changeover).toMatchObject({ state: 'drafting', pinnedVersion: null, proposedVersion: 3 });
  });

  it('refuses to pin a proposal that changes nothing (409)', async () => {
    const { id } = await draftingChangeover(lead.id, { edited: false });
    const r = await call(pin.POST, `/api/changeovers/${id}/pin`, { method: 'POST', cookie: as(lead), params: at(id) });
    expect(r.status).toBe(409);
    expect((r.body as { error: string }).error).toMatch(/Nothing to check yet/);
  });

  it('the diff follows the pin', async () => {
    const { id } = await draftingChangeover(lead.id);
    const r = await call(diffRoute.GET, `/api/changeovers/${id}/diff`, { cookie: as(lead), params: at(id) });
    expect(r.status).toBe(200);
    const body = r.body as { baseVersion: number; proposedVersion: number; pinned: boolean; diff: { summary: { total: number; areas: Record<string, { total: number }> } } };
    expect(body).toMatchObject({ baseVersion: 1, proposedVersion: 2, pinned: false });
    expect(body.diff.summary.areas.devices.total).toBe(1);
    expect(body.diff.summary.areas.wiring.total).toBe(8);
  });
});

describe('sign-off', () => {
  it('refuses a signature while the evidence is not ready, and says why (409 with blockers)', async () => {
    const { id, cellId } = await draftingChangeover(lead.id, { countersignerId: shiftLead.id });
    const early = await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead) });
    expect(early.status).toBe(409);
    expect((early.body as { blockers: string[] }).blockers.join(' ')).toMatch(/not pinned/);

    const verdicts = await pinAndProve(id, cellId, lead.id, [YELLOW_ON_OPEN_GUARD, ROBOT_GUARD_BOTH_DOORS]);
    expect(verdicts.get(YELLOW_ON_OPEN_GUARD.title)?.status).toBe('proved');
    expect(verdicts.get(ROBOT_GUARD_BOTH_DOORS.title)?.status).toBe('violated');
    const violated = await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead) });
    expect(violated.status).toBe(409);
    const blockers = (violated.body as { blockers: string[] }).blockers;
    expect(blockers).toHaveLength(1);
    expect(blockers[0]).toContain(ROBOT_GUARD_BOTH_DOORS.title);
    expect(blockers[0]).toMatch(/violated/);
  });

  it('needs the signer’s own name and the pin they looked at', async () => {
    const { id, cellId } = await draftingChangeover(lead.id);
    await acceptViolations(id, lead.id, await pinAndProve(id, cellId, lead.id, [YELLOW_ON_OPEN_GUARD, ROBOT_GUARD_BOTH_DOORS]));
    const wrongName = await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead, 2, { confirmName: 'Someone Else' }) });
    expect(wrongName.status).toBe(422);
    expect((wrongName.body as { fields: Json }).fields).toHaveProperty('confirmName');
    const stale = await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead, 3) });
    expect(stale.status).toBe(409);
    const ok = await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead, 2, { confirmName: ` ${lead.name.toUpperCase()} ` }) });
    expect(ok.status).toBe(200);
    expect((ok.body as { changeover: Changeover }).changeover.signedBy?.id).toBe(lead.id);
  });

  it('the same person cannot countersign; a second person can, and the record holds the hashes, verdicts and reasons', async () => {
    const { id, cellId } = await draftingChangeover(lead.id, { countersignerId: shiftLead.id });
    await acceptViolations(id, lead.id, await pinAndProve(id, cellId, lead.id, [YELLOW_ON_OPEN_GUARD, ROBOT_GUARD_BOTH_DOORS]));

    // Nobody countersigns before the signature.
    const tooEarly = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(shiftLead), params: at(id), body: signature(shiftLead) });
    expect(tooEarly.status).toBe(409);

    expect((await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead) })).status).toBe(200);
    const self = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead) });
    expect(self.status).toBe(403);
    expect((self.body as { error: string }).error).toMatch(/second person/);
    // A lead who was not asked cannot even see it.
    expect((await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(otherLead), params: at(id), body: signature(otherLead) })).status).toBe(404);
    expect((await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(student), params: at(id), body: signature(student) })).status).toBe(403);

    const r = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(shiftLead), params: at(id), body: signature(shiftLead) });
    expect(r.status).toBe(201);
    const record = (r.body as { record: SignedRecord }).record;
    const base = await getVersion(cellId, 1);
    const proposed = await getVersion(cellId, 2);
    expect(record).toMatchObject({
      baseVersion: 1,
      proposedVersion: 2,
      baseSha256: documentSha256(base!.document),
      proposedSha256: documentSha256(proposed!.document),
      signedBy: { id: lead.id, name: lead.name },
      countersignedBy: { id: shiftLead.id, name: shiftLead.name, role: 'lead' },
    });
    expect(record.baseSha256).not.toBe(record.proposedSha256);
    expect((record.diffSummary as { total: number }).total).toBeGreaterThan(10);
    const evidence = record.evidence as { ranOn: Json; proofs: { title: string; proposed: { status: string }; acceptance: { reason: string } | null }[] };
    expect(evidence.ranOn).toEqual({ baseVersion: 1, proposedVersion: 2 });
    const broken = evidence.proofs.find((p) => p.title === ROBOT_GUARD_BOTH_DOORS.title)!;
    expect(broken.proposed.status).toBe('violated');
    expect(broken.acceptance?.reason).toMatch(/follow-up change/);

    expect(((await read(lead, id)).body as { changeover: Changeover }).changeover.state).toBe('signed-off');
    const again = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(admin), params: at(id), body: signature(admin) });
    expect(again.status).toBe(409);
    const fetched = await call(recordRoute.GET, `/api/changeovers/${id}/record`, { cookie: as(admin), params: at(id) });
    expect((fetched.body as { record: SignedRecord }).record.proposedSha256).toBe(record.proposedSha256);
  });

  it('the admin may countersign without being named', async () => {
    const { id, cellId } = await draftingChangeover(lead.id);
    await pinAndProve(id, cellId, lead.id, [YELLOW_ON_OPEN_GUARD]);
    expect((await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead) })).status).toBe(200);
    const r = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(admin), params: at(id), body: signature(admin) });
    expect(r.status).toBe(201);
    expect((r.body as { record: SignedRecord }).record.countersignedBy.role).toBe('admin');
  });

  it('a taken-back acceptance stops the countersignature (409 with the reason)', async () => {
    const { id, cellId } = await draftingChangeover(lead.id, { countersignerId: shiftLead.id });
    await acceptViolations(id, lead.id, await pinAndProve(id, cellId, lead.id, [YELLOW_ON_OPEN_GUARD, ROBOT_GUARD_BOTH_DOORS]));
    expect((await call(sign.POST, `/api/changeovers/${id}/sign`, { method: 'POST', cookie: as(lead), params: at(id), body: signature(lead) })).status).toBe(200);
    await db()('changeover_acceptances').where({ changeover_id: id }).delete();
    const r = await call(countersign.POST, `/api/changeovers/${id}/countersign`, { method: 'POST', cookie: as(shiftLead), params: at(id), body: signature(shiftLead) });
    expect(r.status).toBe(409);
    expect((r.body as { blockers: string[] }).blockers[0]).toContain(ROBOT_GUARD_BOTH_DOORS.title);
  });
});

/** A signed-off changeover of the demo lead on a fresh cell. */
async function signedOff(): Promise<{ id: string; cellId: string }> {
  const made = await draftingChangeover(lead.id, { countersignerId: shiftLead.id });
  await pinAndProve(made.id, made.cellId, lead.id, [YELLOW_ON_OPEN_GUARD]);
  expect((await call(sign.POST, `/api/changeovers/${made.id}/sign`, { method: 'POST', cookie: as(lead), params: at(made.id), body: signature(lead) })).status).toBe(200);
  expect((await call(countersign.POST, `/api/changeovers/${made.id}/countersign`, { method: 'POST', cookie: as(shiftLead), params: at(made.id), body: signature(shiftLead) })).status).toBe(201);
  return made;
}

describe('the signed record', () => {
  it('is refused any UPDATE or DELETE by the database itself', async () => {
    const { id } = await signedOff();
    await expect(db()('changeover_records').where({ changeover_id: id }).update({ title: 'Quietly changed' })).rejects.toThrow(/cannot be changed/);
    await expect(db()('changeover_records').where({ changeover_id: id }).delete()).rejects.toThrow(/cannot be changed/);
    await expect(db()('changeovers').where({ id }).delete()).rejects.toThrow();
    const row = await db()('changeover_records').where({ changeover_id: id }).first('title');
    expect(row.title).toBe('Test changeover');
  });

  it('refuses the same person in both signatures even past the app (check constraint)', async () => {
    const { id } = await signedOff();
    const row = await db()('changeover_records').where({ changeover_id: id }).first();
    const { id: other } = await draftingChangeover(lead.id);
    await expect(
      db()('changeover_records').insert({ ...row, changeover_id: other, countersigned_by: row.signed_by, diff_summary: JSON.stringify(row.diff_summary), evidence: JSON.stringify(row.evidence) }),
    ).rejects.toThrow(/two_people/);
  });
});

describe('rollback', () => {
  it('makes the base the current version again, as a new version equal to the base document, recorded against the changeover', async () => {
    const { id, cellId } = await signedOff();
    const r = await call(rollback.POST, `/api/changeovers/${id}/rollback`, { method: 'POST', cookie: as(lead), params: at(id), body: { confirm: true } });
    expect(r.status).toBe(200);
    const body = r.body as { version: number; changeover: Changeover };
    expect(body.version).toBe(3);
    expect(body.changeover).toMatchObject({ state: 'rolled-back', rollbackVersion: 3, rolledBackBy: { id: lead.id } });
    const restored = await getVersion(cellId);
    const base = await getVersion(cellId, 1);
    expect(restored!.version).toBe(3);
    expect(restored!.document).toEqual(base!.document);
    expect(documentSha256(restored!.document)).toBe(documentSha256(base!.document));
    expect(restored!.message).toContain('Test changeover');
    expect(restored!.authorId).toBe(lead.id);
    // Once is enough; the admin and the countersigner do not roll back.
    expect((await call(rollback.POST, `/api/changeovers/${id}/rollback`, { method: 'POST', cookie: as(lead), params: at(id), body: { confirm: true } })).status).toBe(409);
    expect((await call(rollback.POST, `/api/changeovers/${id}/rollback`, { method: 'POST', cookie: as(shiftLead), params: at(id), body: { confirm: true } })).status).toBe(403);
    // The record is still there, unchanged.
    expect((await call(recordRoute.GET, `/api/changeovers/${id}/record`, { cookie: as(lead), params: at(id) })).status).toBe(200);
  });

  it('needs the confirmation in the body', async () => {
    const { id } = await draftingChangeover(lead.id);
    expect((await call(rollback.POST, `/api/changeovers/${id}/rollback`, { method: 'POST', cookie: as(lead), params: at(id), body: {} })).status).toBe(422);
  });

  it('abandons a drafting proposal: the base is restored and the changeover is withdrawn; with no edits, no version is made', async () => {
    const edited = await draftingChangeover(lead.id);
    const r = await call(rollback.POST, `/api/changeovers/${edited.id}/rollback`, { method: 'POST', cookie: as(lead), params: at(edited.id), body: { confirm: true } });
    expect((r.body as { changeover: Changeover }).changeover.state).toBe('withdrawn');
    expect((await getVersion(edited.cellId))!.document).toEqual(baseDocument());
    expect((await getVersion(edited.cellId))!.version).toBe(3);

    const untouched = await draftingChangeover(lead.id, { edited: false });
    const u = await call(rollback.POST, `/api/changeovers/${untouched.id}/rollback`, { method: 'POST', cookie: as(lead), params: at(untouched.id), body: { confirm: true } });
    expect((u.body as { version: number }).version).toBe(1);
    expect((await getVersion(untouched.cellId))!.version).toBe(1);
    // Closed for good: no pin, no signature.
    expect((await call(pin.POST, `/api/changeovers/${untouched.id}/pin`, { method: 'POST', cookie: as(lead), params: at(untouched.id) })).status).toBe(409);
  });
});

describe('the I/O change sheet', () => {
  it('is a CSV of what the electricians re-terminate', async () => {
    const { id } = await draftingChangeover(lead.id);
    const res = await ioSheet.GET(new Request(`http://127.0.0.1/api/changeovers/${id}/io-sheet`, { headers: { cookie: as(lead) } }), { params: Promise.resolve(at(id)) });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="changeover-test-cell-io-changes-v1-to-v2\.csv"/);
    const text = await res.text();
    const rows = Papa.parse<string[]>(text.trim()).data;
    expect(rows[0]).toEqual(['Action', 'Point / address', 'Label', 'Was', 'Now', 'Map', 'Wire', 'Source']);
    expect(rows).toContainEqual(['move', 'DI4', 'Guard closed', 'rack 1 / slot 2 / ch 3', 'rack 1 / slot 6 / ch 3', 'live', '', 'pointMap:pm-di']);
    expect(rows.some((r) => r[0] === 'add' && r[1] === '%IX0.7' && r[6] === 'w-rear-guard')).toBe(true);
    expect((await call(ioSheet.GET, `/api/changeovers/${id}/io-sheet`, { cookie: as(otherLead), params: at(id) })).status).toBe(404);
  });
});

describe('the demo changeover', () => {
  it('is ready for the demo lead to open: drafting, base v1 against the rear-guard proposal, the shift lead asked to countersign', async () => {
    const cell = await db()('cells').where({ owner_id: lead.id, name: DEMO_CELL_NAMES.leadCopy }).first('id');
    const row = await db()('changeovers').where({ cell_id: cell.id, title: DEMO_CHANGEOVER.title }).first('id');
    const r = await read(lead, row.id);
    expect(r.status).toBe(200);
    const co = (r.body as { changeover: Changeover }).changeover;
    expect(co).toMatchObject({ state: 'drafting', baseVersion: 1, countersigner: { id: shiftLead.id } });
    expect(co.proposedVersion).toBeGreaterThanOrEqual(2);
    expect((await read(shiftLead, row.id)).status).toBe(200);
    const d = await call(diffRoute.GET, `/api/changeovers/${row.id}/diff`, { cookie: as(lead), params: at(row.id) });
    const areas = (d.body as { diff: { areas: Record<string, { id: string; kind: string }[]> } }).diff.areas;
    expect(areas.devices.map((e) => e.id)).toContain('rearGuard');
    expect(areas.modules.map((e) => e.id)).toContain('ctl-di');
  });
});
