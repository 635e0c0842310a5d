import 'server-only';
import { db } from './knex';
import { isUuid } from './users';

/**
 * Which files in the bucket (lib/storage) were made from which record: the printed report of a
 * signed-off changeover and the exported archives of a run. The bytes are in the bucket; these
 * rows say where, how big, and their SHA-256.
 */

export interface StoredFile {
  objectKey: string;
  sizeBytes: number;
  sha256: string;
  createdAt: string;
}

export interface RunArchive extends StoredFile {
  id: string;
  runId: string;
  hiddenIncluded: boolean;
  createdBy: string;
}

const iso = (d: Date | string) => new Date(d).toISOString();

/** The printed report of a changeover, or null while none has been made. */
export async function findChangeoverReport(changeoverId: string): Promise<StoredFile | null> {
  if (!isUuid(changeoverId)) return null;
  const r = await db()('changeover_reports').where({ changeover_id: changeoverId }).first();
  return r ? { objectKey: r.object_key, sizeBytes: r.size_bytes, sha256: r.sha256, createdAt: iso(r.created_at) } : null;
}

/** Records the report's object; made again (same record, same key), the row is brought up to date. */
export async function saveChangeoverReport(changeoverId: string, file: Omit<StoredFile, 'createdAt'>): Promise<void> {
  await db()('changeover_reports')
    .insert({ changeover_id: changeoverId, object_key: file.objectKey, size_bytes: file.sizeBytes, sha256: file.sha256 })
    .onConflict('changeover_id')
    .merge(['object_key', 'size_bytes', 'sha256']);
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toArchive(r: any): RunArchive {
  return {
    id: r.id,
    runId: r.run_id,
    objectKey: r.object_key,
    sizeBytes: r.size_bytes,
    sha256: r.sha256,
    hiddenIncluded: r.hidden_included,
    createdBy: r.created_by,
    createdAt: iso(r.created_at),
  };
}

/**
 * Records an exported archive. The same content exported again (same run, same SHA-256) is the
 * same row: the first one is answered, so exporting twice stores nothing twice.
 */
export async function saveRunArchive(input: { runId: string; objectKey: string; sizeBytes: number; sha256: string; hiddenIncluded: boolean; createdBy: string }): Promise<RunArchive> {
  const inserted = await db()('run_archives')
    .insert({
      run_id: input.runId,
      object_key: input.objectKey,
      size_bytes: input.sizeBytes,
      sha256: input.sha256,
      hidden_included: input.hiddenIncluded,
      created_by: input.createdBy,
    })
    .onConflict(['run_id', 'sha256'])
    .ignore()
    .returning('*');
  if (inserted[0]) return toArchive(inserted[0]);
  return toArchive(await db()('run_archives').where({ run_id: input.runId, sha256: input.sha256 }).first());
}

/** One archive of a run, or null (a malformed id is simply not found). */
export async function findRunArchive(runId: string, archiveId: string): Promise<RunArchive | null> {
  if (!isUuid(runId) || !isUuid(archiveId)) return null;
  const r = await db()('run_archives').where({ run_id: runId, id: archiveId }).first();
  return r ? toArchive(r) : null;
}
