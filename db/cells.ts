import 'server-only';
import type { Knex } from 'knex';
import type { CellDocument } from '@/simulator';
import { upgradeCellDocument } from '@/simulator';
import { db } from './knex';
import { isUuid } from './users';

export type CellOrigin = 'new' | 'template' | 'duplicate' | 'shared-copy' | 'import';

export interface CohortRef {
  cohortId: string;
  cohortName: string;
}

export interface CellRecord {
  id: string;
  name: string;
  ownerId: string;
  ownerName: string;
  origin: CellOrigin;
  sourceCellId: string | null;
  sourceVersion: number | null;
  latestVersion: number;
  createdAt: string;
  updatedAt: string;
}

export interface CellSummary extends CellRecord {
  versionCount: number;
  sharedWith: CohortRef[];
}

/** A cell shared with one or more of a student's cohorts, with the student's own copy if opened. */
export interface SharedCellSummary {
  id: string;
  name: string;
  ownerName: string;
  latestVersion: number;
  updatedAt: string;
  cohorts: CohortRef[];
  myCopyId: string | null;
}

export interface CellVersionMeta {
  version: number;
  authorId: string;
  authorName: string;
  message: string;
  createdAt: string;
}

export interface CellVersion extends CellVersionMeta {
  document: CellDocument;
}

const iso = (d: Date | string) => new Date(d).toISOString();

function recordQuery(k: Knex = db()) {
  return k('cells as c')
    .join('users as o', 'o.id', 'c.owner_id')
    .whereNull('c.deleted_at')
    .select(
      'c.id',
      'c.name',
      'c.owner_id',
      'o.name as owner_name',
      'c.origin',
      'c.source_cell_id',
      'c.source_version',
      'c.created_at',
      'c.updated_at',
      k.raw('(select coalesce(max(v.version), 0) from cell_versions v where v.cell_id = c.id)::int as latest_version'),
      k.raw('(select count(*) from cell_versions v where v.cell_id = c.id)::int as version_count'),
    );
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toRecord(r: any): CellRecord {
  return {
    id: r.id,
    name: r.name,
    ownerId: r.owner_id,
    ownerName: r.owner_name,
    origin: r.origin,
    sourceCellId: r.source_cell_id,
    sourceVersion: r.source_version,
    latestVersion: r.latest_version,
    createdAt: iso(r.created_at),
    updatedAt: iso(r.updated_at),
  };
}

async function sharesOf(cellIds: string[]): Promise<Map<string, CohortRef[]>> {
  const out = new Map<string, CohortRef[]>();
  if (cellIds.length === 0) return out;
  const rows = await db()('cell_shares as s')
    .join('cohorts as co', 'co.id', 's.cohort_id')
    .whereIn('s.cell_id', cellIds)
    .select('s.cell_id', 's.cohort_id', 'co.name')
    .orderBy('co.name');
  for (const r of rows) {
    const list = out.get(r.cell_id) ?? [];
    list.push({ cohortId: r.cohort_id, cohortName: r.name });
    out.set(r.cell_id, list);
  }
  return out;
}

/** The cells a user owns (not deleted), most recently changed first, with their shares. */
export async function listOwnedCells(ownerId: string): Promise<CellSummary[]> {
  const rows = await recordQuery().where('c.owner_id', ownerId).orderBy('c.updated_at', 'desc');
  const shares = await sharesOf(rows.map((r) => r.id));
  return rows.map((r) => ({ ...toRecord(r), versionCount: r.version_count, sharedWith: shares.get(r.id) ?? [] }));
}

/** Cells shared with any cohort the user belongs to, with the user's own copy of each (if opened). */
export async function listCellsSharedWithMember(userId: string): Promise<SharedCellSummary[]> {
  const k = db();
  const rows = await k('cell_shares as s')
    .join('memberships as m', 'm.cohort_id', 's.cohort_id')
    .join('cohorts as co', 'co.id', 's.cohort_id')
    .join('cells as c', 'c.id', 's.cell_id')
    .join('users as o', 'o.id', 'c.owner_id')
    .where('m.user_id', userId)
    .whereNull('c.deleted_at')
    .select(
      'c.id',
      'c.name',
      'o.name as owner_name',
      'c.updated_at',
      's.cohort_id',
      'co.name as cohort_name',
      k.raw('(select coalesce(max(v.version), 0) from cell_versions v where v.cell_id = c.id)::int as latest_version'),
      k.raw(
        "(select mine.id from cells mine where mine.owner_id = ? and mine.source_cell_id = c.id and mine.origin = 'shared-copy' and mine.deleted_at is null) as my_copy_id",
        [userId],
      ),
    )
    .orderBy([{ column: 'c.name' }, { column: 'co.name' }]);
  const byCell = new Map<string, SharedCellSummary>();
  for (const r of rows) {
    const entry: SharedCellSummary = byCell.get(r.id) ?? {
      id: r.id,
      name: r.name,
      ownerName: r.owner_name,
      latestVersion: r.latest_version,
      updatedAt: iso(r.updated_at),
      cohorts: [],
      myCopyId: r.my_copy_id ?? null,
    };
    entry.cohorts.push({ cohortId: r.cohort_id, cohortName: r.cohort_name });
    byCell.set(r.id, entry);
  }
  return [...byCell.values()];
}

/** One cell that is not deleted, or null. */
export async function findCell(id: string): Promise<CellRecord | null> {
  if (!isUuid(id)) return null;
  const row = await recordQuery().where('c.id', id).first();
  return row ? toRecord(row) : null;
}

export interface NewCell {
  ownerId: string;
  name: string;
  origin: CellOrigin;
  document: CellDocument;
  message: string;
  sourceCellId?: string | null;
  sourceVersion?: number | null;
}

async function insertCell(trx: Knex, input: NewCell): Promise<string> {
  const [cell] = await trx('cells')
    .insert({
      name: input.name,
      owner_id: input.ownerId,
      origin: input.origin,
      source_cell_id: input.sourceCellId ?? null,
      source_version: input.sourceVersion ?? null,
    })
    .returning('id');
  await trx('cell_versions').insert({
    cell_id: cell.id,
    version: 1,
    document: JSON.stringify(input.document),
    author_id: input.ownerId,
    message: input.message,
  });
  return cell.id;
}

/** Creates a cell with its first version (version 1) in one transaction. */
export async function createCell(input: NewCell): Promise<CellRecord> {
  const id = await db().transaction((trx) => insertCell(trx, input));
  return (await findCell(id))!;
}

export async function renameCell(id: string, name: string): Promise<CellRecord | null> {
  await db()('cells').where({ id }).whereNull('deleted_at').update({ name, updated_at: db().fn.now() });
  return findCell(id);
}

/** Soft delete: the cell disappears from every list and route; its versions stay for runs that cite them. */
/** Soft-deletes a cell and drops its shares in one transaction (students no longer see it, and nothing is half done). */
export async function deleteCell(id: string): Promise<boolean> {
  return db().transaction(async (trx) => {
    const n = await trx('cells').where({ id }).whereNull('deleted_at').update({ deleted_at: trx.fn.now() });
    await trx('cell_shares').where({ cell_id: id }).delete();
    return n > 0;
  });
}

function versionQuery(cellId: string) {
  return db()('cell_versions as v')
    .join('users as a', 'a.id', 'v.author_id')
    .where('v.cell_id', cellId)
    .select('v.version', 'v.author_id', 'a.name as author_name', 'v.message', 'v.created_at');
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toMeta(r: any): CellVersionMeta {
  return { version: r.version, authorId: r.author_id, authorName: r.author_name, message: r.message, createdAt: iso(r.created_at) };
}

/** Every version of a cell, newest first, without documents. */
export async function listVersions(cellId: string): Promise<CellVersionMeta[]> {
  return (await versionQuery(cellId).orderBy('v.version', 'desc')).map(toMeta);
}

/** One version with its document; the latest when `version` is omitted. */
export async function getVersion(cellId: string, version?: number): Promise<CellVersion | null> {
  const q = versionQuery(cellId).select('v.document');
  if (version !== undefined) q.where('v.version', version);
  else q.orderBy('v.version', 'desc');
  const row = await q.first();
  // A row written under an older schema version (before its migration, or by an older process) reads as the current one.
  return row ? { ...toMeta(row), document: upgradeCellDocument(row.document) as CellDocument } : null;
}

export async function countVersions(cellId: string): Promise<number> {
  const row = await db()('cell_versions').where({ cell_id: cellId }).count<{ n: string }[]>({ n: '*' }).first();
  return Number(row?.n ?? 0);
}

export type SaveResult = { ok: true; version: CellVersionMeta } | { ok: false; reason: 'stale'; latestVersion: number } | { ok: false; reason: 'missing' };

/**
 * Saves a new version when `baseVersion` is still the latest. The cell row is locked for the
 * check-and-insert, so two saves on the same base cannot both succeed: the second is stale.
 */
export async function saveVersion(cellId: string, authorId: string, baseVersion: number, document: CellDocument, message: string): Promise<SaveResult> {
  return db().transaction(async (trx) => {
    const cell = await trx('cells').where({ id: cellId }).whereNull('deleted_at').forUpdate().first('id');
    if (!cell) return { ok: false, reason: 'missing' } as const;
    const latest = await trx('cell_versions').where({ cell_id: cellId }).max<{ v: number | null }[]>({ v: 'version' }).first();
    const latestVersion = latest?.v ?? 0;
    if (latestVersion !== baseVersion) return { ok: false, reason: 'stale', latestVersion } as const;
    const [row] = await trx('cell_versions')
      .insert({ cell_id: cellId, version: latestVersion + 1, document: JSON.stringify(document), author_id: authorId, message })
      .returning(['version', 'author_id', 'message', 'created_at']);
    await trx('cells').where({ id: cellId }).update({ updated_at: trx.fn.now() });
    const author = await trx('users').where({ id: authorId }).first('name');
    return { ok: true, version: toMeta({ ...row, author_name: author?.name ?? '' }) } as const;
  });
}

/** Cohorts a cell is shared with. */
export async function listShares(cellId: string): Promise<CohortRef[]> {
  return (await sharesOf([cellId])).get(cellId) ?? [];
}

/** Shares a cell with a cohort; sharing twice is a no-op. */
export async function shareCell(cellId: string, cohortId: string, sharedBy: string): Promise<void> {
  await db()('cell_shares').insert({ cell_id: cellId, cohort_id: cohortId, shared_by: sharedBy }).onConflict(['cell_id', 'cohort_id']).ignore();
}

/** Removes a share; copies students already opened stay theirs. */
export async function unshareCell(cellId: string, cohortId: string): Promise<boolean> {
  if (!isUuid(cohortId)) return false;
  return (await db()('cell_shares').where({ cell_id: cellId, cohort_id: cohortId }).delete()) > 0;
}

/** True when the cell is shared with a cohort the user belongs to. */
export async function isSharedWithMember(cellId: string, userId: string): Promise<boolean> {
  const row = await db()('cell_shares as s')
    .join('memberships as m', 'm.cohort_id', 's.cohort_id')
    .where({ 's.cell_id': cellId, 'm.user_id': userId })
    .first('s.cell_id');
  return Boolean(row);
}

/**
 * The student's own copy of a shared cell: the existing one, or a new cell whose version 1 is
 * the source's latest version. A concurrent second request hits the partial unique index and
 * returns the copy the first one made.
 */
export async function openStudentCopy(source: CellRecord, studentId: string): Promise<{ cell: CellRecord; created: boolean }> {
  const existing = async () =>
    db()('cells').where({ owner_id: studentId, source_cell_id: source.id, origin: 'shared-copy' }).whereNull('deleted_at').first('id');
  const found = await existing();
  if (found) return { cell: (await findCell(found.id))!, created: false };
  const latest = await getVersion(source.id);
  if (!latest) throw new Error(`cell ${source.id} has no version`);
  try {
    const cell = await createCell({
      ownerId: studentId,
      name: source.name,
      origin: 'shared-copy',
      sourceCellId: source.id,
      sourceVersion: latest.version,
      document: latest.document,
      message: `Copy of "${source.name}" version ${latest.version}`,
    });
    return { cell, created: true };
  } catch (err) {
    if ((err as { code?: string }).code !== '23505') throw err;
    const again = await existing();
    if (!again) throw err;
    return { cell: (await findCell(again.id))!, created: false };
  }
}
