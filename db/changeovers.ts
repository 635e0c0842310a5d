import 'server-only';
import type { Knex } from 'knex';
import type { CellDocument } from '@/simulator';
import { upgradeCellDocument } from '@/simulator';
import type { Role } from './types/users';
import type {
  Changeover,
  ChangeoverEvent,
  ChangeoverEventKind,
  ChangeoverState,
  CountersignerCandidate,
  PersonRef,
  RecordContent,
  SignedRecord,
} from './types/changeovers';
import { db } from './knex';
import { isUuid } from './users';

/**
 * Changeovers: a planned change to one cell (issue #10). See the migration
 * 20261204_401_changeovers for the tables and the state machine; the rules of who may do what
 * live in lib/changeovers/ (access, sign-off), these functions only read and write.
 */
export type { Changeover, ChangeoverEvent, ChangeoverEventKind, ChangeoverState, PersonRef, RecordContent, SignedRecord };
export { CHANGEOVER_STATES } from './types/changeovers';
const iso = (d: Date | string | null) => (d === null ? null : new Date(d).toISOString());

function baseQuery(k: Knex = db()) {
  return k('changeovers as co')
    .join('cells as c', 'c.id', 'co.cell_id')
    .join('users as ob', 'ob.id', 'co.opened_by')
    .leftJoin('users as cs', 'cs.id', 'co.countersigner_id')
    .leftJoin('users as sb', 'sb.id', 'co.signed_by')
    .leftJoin('users as rb', 'rb.id', 'co.rolled_back_by')
    .select(
      'co.*',
      'c.name as cell_name',
      'c.owner_id as cell_owner_id',
      k.raw('(c.deleted_at is null) as cell_active'),
      'ob.name as opened_by_name',
      'cs.name as countersigner_name',
      'sb.name as signed_by_name',
      'rb.name as rolled_back_by_name',
      k.raw('(select coalesce(max(v.version), 0) from cell_versions v where v.cell_id = co.cell_id)::int as latest_version'),
    );
}

const person = (id: string | null, name: string | null): PersonRef | null => (id ? { id, name: name ?? '' } : null);

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toChangeover(r: any): Changeover {
  return {
    id: r.id,
    cellId: r.cell_id,
    cellName: r.cell_name,
    cellOwnerId: r.cell_owner_id,
    cellActive: Boolean(r.cell_active),
    title: r.title,
    description: r.description,
    openedBy: { id: r.opened_by, name: r.opened_by_name },
    baseVersion: r.base_version,
    pinnedVersion: r.proposed_version,
    pinnedAt: iso(r.pinned_at),
    latestVersion: r.latest_version,
    proposedVersion: r.proposed_version ?? r.latest_version,
    state: r.state,
    countersigner: person(r.countersigner_id, r.countersigner_name),
    signedBy: person(r.signed_by, r.signed_by_name),
    signedAt: iso(r.signed_at),
    rolledBackBy: person(r.rolled_back_by, r.rolled_back_by_name),
    rolledBackAt: iso(r.rolled_back_at),
    rollbackVersion: r.rollback_version,
    createdAt: iso(r.created_at)!,
    updatedAt: iso(r.updated_at)!,
  };
}

/** One changeover, or null (a malformed id is simply not found). */
export async function findChangeover(id: string): Promise<Changeover | null> {
  if (!isUuid(id)) return null;
  const row = await baseQuery().where('co.id', id).first();
  return row ? toChangeover(row) : null;
}

/**
 * The changeovers a user may read, most recently changed first: an admin sees all; anyone else
 * those they opened, those on cells they own, and those they are asked to countersign.
 */
export async function listChangeoversFor(user: { id: string; role: Role }): Promise<Changeover[]> {
  const q = baseQuery().orderBy('co.updated_at', 'desc').limit(500);
  if (user.role !== 'admin') {
    q.where((w) => w.where('co.opened_by', user.id).orWhere('c.owner_id', user.id).orWhere('co.countersigner_id', user.id));
  }
  return (await q).map(toChangeover);
}

/** Changeovers of one cell, newest first (for the cell's own pages). */
export async function listChangeoversOfCell(cellId: string): Promise<Changeover[]> {
  if (!isUuid(cellId)) return [];
  return (await baseQuery().where('co.cell_id', cellId).orderBy('co.created_at', 'desc')).map(toChangeover);
}

async function addEvent(trx: Knex, changeoverId: string, kind: ChangeoverEventKind, actorId: string, detail: Record<string, unknown> = {}): Promise<void> {
  await trx('changeover_events').insert({ changeover_id: changeoverId, kind, actor_id: actorId, detail: JSON.stringify(detail) });
  await trx('changeovers').where({ id: changeoverId }).update({ updated_at: trx.fn.now() });
}

/** What happened to a changeover, oldest first. */
export async function listChangeoverEvents(changeoverId: string): Promise<ChangeoverEvent[]> {
  const rows = await db()('changeover_events as e')
    .join('users as u', 'u.id', 'e.actor_id')
    .where('e.changeover_id', changeoverId)
    .orderBy('e.id', 'asc')
    .select('e.id', 'e.kind', 'e.actor_id', 'u.name as actor_name', 'e.detail', 'e.created_at');
  return rows.map((r) => ({
    id: String(r.id),
    kind: r.kind,
    actor: { id: r.actor_id, name: r.actor_name },
    detail: r.detail ?? {},
    createdAt: iso(r.created_at)!,
  }));
}

export interface NewChangeover {
  cellId: string;
  openedBy: string;
  title: string;
  description: string;
  baseVersion: number;
}

export type OpenResult = { ok: true; changeover: Changeover } | { ok: false; reason: 'no-such-version'; latestVersion: number };

/** Opens a changeover in drafting on an existing version of the cell. */
export async function openChangeover(input: NewChangeover): Promise<OpenResult> {
  const id = await db().transaction(async (trx) => {
    const exists = await trx('cell_versions').where({ cell_id: input.cellId, version: input.baseVersion }).first('version');
    if (!exists) return null;
    const [row] = await trx('changeovers')
      .insert({ cell_id: input.cellId, opened_by: input.openedBy, title: input.title, description: input.description, base_version: input.baseVersion })
      .returning('id');
    await addEvent(trx, row.id, 'opened', input.openedBy, { baseVersion: input.baseVersion });
    return row.id as string;
  });
  if (!id) {
    const latest = await db()('cell_versions').where({ cell_id: input.cellId }).max<{ v: number | null }[]>({ v: 'version' }).first();
    return { ok: false, reason: 'no-such-version', latestVersion: latest?.v ?? 0 };
  }
  return { ok: true, changeover: (await findChangeover(id))! };
}

/** Title and description; only while the changeover is not yet signed off (checked by the caller). */
export async function updateChangeoverText(id: string, actorId: string, text: { title: string; description: string }): Promise<void> {
  await db().transaction(async (trx) => {
    await trx('changeovers').where({ id }).update(text);
    await addEvent(trx, id, 'edited', actorId);
  });
}

/** Names (or clears) the person asked to countersign. */
export async function setCountersigner(id: string, actorId: string, countersigner: PersonRef | null): Promise<void> {
  await db().transaction(async (trx) => {
    await trx('changeovers').where({ id }).update({ countersigner_id: countersigner?.id ?? null });
    await addEvent(trx, id, 'countersigner', actorId, { countersigner: countersigner ? { id: countersigner.id, name: countersigner.name } : null });
  });
}

export type StateConflict = { ok: false; reason: 'state'; state: ChangeoverState } | { ok: false; reason: 'missing' };

export type PinResult = { ok: true; baseVersion: number; proposedVersion: number; alreadyPinned: boolean } | StateConflict | { ok: false; reason: 'unchanged' };

/**
 * Pins the proposal to the cell's latest version (drafting → checked), so checks and
 * signatures all speak of one document. Pinning a pinned changeover returns its pin. Refused
 * when the latest version is still the base (nothing to change over).
 */
export async function pinProposal(id: string, actorId: string): Promise<PinResult> {
  return db().transaction(async (trx) => {
    const row = await trx('changeovers').where({ id }).forUpdate().first();
    if (!row) return { ok: false, reason: 'missing' } as const;
    if (row.state === 'checked') return { ok: true, baseVersion: row.base_version, proposedVersion: row.proposed_version, alreadyPinned: true } as const;
    if (row.state !== 'drafting') return { ok: false, reason: 'state', state: row.state } as const;
    const latest = await trx('cell_versions').where({ cell_id: row.cell_id }).max<{ v: number | null }[]>({ v: 'version' }).first();
    const proposed = latest?.v ?? 0;
    if (proposed <= row.base_version) return { ok: false, reason: 'unchanged' } as const;
    await trx('changeovers').where({ id }).update({ state: 'checked', proposed_version: proposed, pinned_at: trx.fn.now() });
    await addEvent(trx, id, 'pinned', actorId, { proposedVersion: proposed });
    return { ok: true, baseVersion: row.base_version, proposedVersion: proposed, alreadyPinned: false } as const;
  });
}

/** Back to drafting (checked → drafting): the pin and any waiting signature are dropped. */
export async function unpinProposal(id: string, actorId: string): Promise<{ ok: true } | StateConflict> {
  return db().transaction(async (trx) => {
    const row = await trx('changeovers').where({ id }).forUpdate().first();
    if (!row) return { ok: false, reason: 'missing' } as const;
    if (row.state === 'drafting') return { ok: true } as const;
    if (row.state !== 'checked') return { ok: false, reason: 'state', state: row.state } as const;
    await trx('changeovers').where({ id }).update({ state: 'drafting', proposed_version: null, pinned_at: null, signed_by: null, signed_at: null });
    await addEvent(trx, id, 'unpinned', actorId, { proposedVersion: row.proposed_version, hadSignature: Boolean(row.signed_by) });
    return { ok: true } as const;
  });
}

/**
 * The opener's signature on a pinned changeover. `expect` is the pin the signer looked at: a
 * pin that moved in between is a conflict, not a signature on something else.
 */
export async function signChangeover(
  id: string,
  signerId: string,
  expect: { baseVersion: number; proposedVersion: number },
): Promise<{ ok: true } | StateConflict | { ok: false; reason: 'moved' } | { ok: false; reason: 'already-signed' }> {
  return db().transaction(async (trx) => {
    const row = await trx('changeovers').where({ id }).forUpdate().first();
    if (!row) return { ok: false, reason: 'missing' } as const;
    if (row.state !== 'checked') return { ok: false, reason: 'state', state: row.state } as const;
    if (row.base_version !== expect.baseVersion || row.proposed_version !== expect.proposedVersion) return { ok: false, reason: 'moved' } as const;
    if (row.signed_by) return { ok: false, reason: 'already-signed' } as const;
    await trx('changeovers').where({ id }).update({ signed_by: signerId, signed_at: trx.fn.now() });
    await addEvent(trx, id, 'signed', signerId, { baseVersion: row.base_version, proposedVersion: row.proposed_version });
    return { ok: true } as const;
  });
}

/** Takes back the opener's signature before anyone countersigned. */
export async function withdrawSignature(id: string, actorId: string): Promise<{ ok: true } | StateConflict> {
  return db().transaction(async (trx) => {
    const row = await trx('changeovers').where({ id }).forUpdate().first();
    if (!row) return { ok: false, reason: 'missing' } as const;
    if (row.state === 'drafting') return { ok: true } as const;
    if (row.state !== 'checked') return { ok: false, reason: 'state', state: row.state } as const;
    if (!row.signed_by) return { ok: true } as const;
    await trx('changeovers').where({ id }).update({ signed_by: null, signed_at: null });
    await addEvent(trx, id, 'signature-withdrawn', actorId);
    return { ok: true } as const;
  });
}

export type CountersignResult =
  | { ok: true; record: SignedRecord }
  | StateConflict
  | { ok: false; reason: 'not-signed' }
  | { ok: false; reason: 'same-person' }
  | { ok: false; reason: 'moved' };

/**
 * The second signature: writes the immutable record and closes the changeover (signed-off) in
 * one transaction under the changeover's row lock, so two countersignatures cannot both land
 * and the record always matches the pin it was built from. `build` runs inside the lock with
 * the row as it is then; the caller has checked the evidence.
 */
export async function countersignChangeover(
  id: string,
  countersigner: { id: string; name: string; role: Role },
  expect: { baseVersion: number; proposedVersion: number },
  content: RecordContent,
): Promise<CountersignResult> {
  return db().transaction(async (trx) => {
    const row = await trx('changeovers').where({ id }).forUpdate().first();
    if (!row) return { ok: false, reason: 'missing' } as const;
    if (row.state !== 'checked') return { ok: false, reason: 'state', state: row.state } as const;
    if (!row.signed_by) return { ok: false, reason: 'not-signed' } as const;
    if (row.signed_by === countersigner.id) return { ok: false, reason: 'same-person' } as const;
    if (row.base_version !== expect.baseVersion || row.proposed_version !== expect.proposedVersion) return { ok: false, reason: 'moved' } as const;
    if (content.baseVersion !== row.base_version || content.proposedVersion !== row.proposed_version) return { ok: false, reason: 'moved' } as const;
    const signer = await trx('users').where({ id: row.signed_by }).first('name');
    await trx('changeover_records').insert({
      changeover_id: id,
      cell_id: row.cell_id,
      cell_name: content.cellName,
      title: content.title,
      description: content.description,
      base_version: content.baseVersion,
      proposed_version: content.proposedVersion,
      base_sha256: content.baseSha256,
      proposed_sha256: content.proposedSha256,
      diff_summary: JSON.stringify(content.diffSummary),
      evidence: JSON.stringify(content.evidence),
      signed_by: row.signed_by,
      signed_by_name: signer?.name ?? '',
      signed_at: row.signed_at,
      countersigned_by: countersigner.id,
      countersigned_by_name: countersigner.name,
      countersigned_by_role: countersigner.role,
      countersigned_at: trx.fn.now(),
    });
    await trx('changeovers').where({ id }).update({ state: 'signed-off' });
    await addEvent(trx, id, 'countersigned', countersigner.id, { proposedVersion: row.proposed_version });
    return { ok: true, record: (await readRecord(trx, id))! } as const;
  });
}

async function readRecord(k: Knex, changeoverId: string): Promise<SignedRecord | null> {
  const r = await k('changeover_records').where({ changeover_id: changeoverId }).first();
  if (!r) return null;
  return {
    changeoverId: r.changeover_id,
    cellId: r.cell_id,
    cellName: r.cell_name,
    title: r.title,
    description: r.description,
    baseVersion: r.base_version,
    proposedVersion: r.proposed_version,
    baseSha256: r.base_sha256,
    proposedSha256: r.proposed_sha256,
    diffSummary: r.diff_summary,
    evidence: r.evidence,
    signedBy: { id: r.signed_by, name: r.signed_by_name },
    signedAt: iso(r.signed_at)!,
    countersignedBy: { id: r.countersigned_by, name: r.countersigned_by_name, role: r.countersigned_by_role },
    countersignedAt: iso(r.countersigned_at)!,
    createdAt: iso(r.created_at)!,
  };
}

/** The signed record of a changeover, or null before sign-off. */
export function findSignedRecord(changeoverId: string): Promise<SignedRecord | null> {
  if (!isUuid(changeoverId)) return Promise.resolve(null);
  return readRecord(db(), changeoverId);
}

export type RollbackResult = { ok: true; version: number; state: 'rolled-back' | 'withdrawn' } | StateConflict | { ok: false; reason: 'cell-gone' };

/**
 * Makes the base document the cell's current version again, as a new version whose message
 * names the changeover, and records it against the changeover. After sign-off this is a
 * rollback (→ rolled-back); before it, abandoning the proposal (→ withdrawn). One transaction
 * that locks the changeover, then the cell (the same order as nothing else takes both), so a
 * workspace save racing with it either lands before (and is superseded) or after.
 */
export async function rollBackChangeover(id: string, actorId: string): Promise<RollbackResult> {
  return db().transaction(async (trx) => {
    const row = await trx('changeovers').where({ id }).forUpdate().first();
    if (!row) return { ok: false, reason: 'missing' } as const;
    if (row.state === 'rolled-back' || row.state === 'withdrawn') return { ok: false, reason: 'state', state: row.state } as const;
    const cell = await trx('cells').where({ id: row.cell_id }).whereNull('deleted_at').forUpdate().first('id');
    if (!cell) return { ok: false, reason: 'cell-gone' } as const;
    const base = await trx('cell_versions').where({ cell_id: row.cell_id, version: row.base_version }).first('document');
    const latest = await trx('cell_versions').where({ cell_id: row.cell_id }).max<{ v: number }[]>({ v: 'version' }).first();
    const next: 'rolled-back' | 'withdrawn' = row.state === 'signed-off' ? 'rolled-back' : 'withdrawn';
    // A proposal abandoned before anyone edited the cell leaves the base as it is: no empty version.
    let version: number = row.base_version;
    if ((latest?.v ?? 0) !== row.base_version) {
      version = (latest?.v ?? 0) + 1;
      const verb = next === 'rolled-back' ? 'Rolled back' : 'Abandoned';
      await trx('cell_versions').insert({
        cell_id: row.cell_id,
        version,
        document: JSON.stringify(upgradeCellDocument(base.document) as CellDocument),
        author_id: actorId,
        message: `${verb} changeover "${row.title}": version ${row.base_version} restored`,
      });
      await trx('cells').where({ id: row.cell_id }).update({ updated_at: trx.fn.now() });
    }
    await trx('changeovers')
      .where({ id })
      .update({ state: next, rolled_back_by: actorId, rolled_back_at: trx.fn.now(), rollback_version: version });
    await addEvent(trx, id, next === 'rolled-back' ? 'rolled-back' : 'withdrawn', actorId, { version, baseVersion: row.base_version });
    return { ok: true, version, state: next } as const;
  });
}

/** Two versions' documents (base and proposal) of one cell, in one query. */
export async function versionDocuments(cellId: string, versions: number[]): Promise<Map<number, CellDocument>> {
  const rows = await db()('cell_versions').where({ cell_id: cellId }).whereIn('version', versions).select('version', 'document');
  return new Map(rows.map((r) => [r.version as number, upgradeCellDocument(r.document) as CellDocument]));
}

/** People who may be asked to countersign: active leads, trainers and admins other than `exceptId`. */
export async function listCountersignerCandidates(exceptId: string): Promise<CountersignerCandidate[]> {
  const rows = await db()('users')
    .whereIn('role', ['lead', 'trainer', 'admin'])
    .where('disabled', false)
    .whereNot('id', exceptId)
    .orderBy([{ column: 'role' }, { column: 'name' }])
    .select('id', 'name', 'role', 'organization');
  return rows.map((r) => ({ id: r.id, name: r.name, role: r.role, organization: r.organization }));
}
