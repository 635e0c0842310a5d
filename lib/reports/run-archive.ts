import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { runView, type RunReader } from '@/lib/runs/access';
import { sanitiseEvents } from '@/lib/runs/sanitise';
import { storedLog } from '@/lib/runs/service';
import { getVersion } from '@/db/cells';
import { findDrill } from '@/db/drills';
import type { Run } from '@/db/runs';
import { findRunArchive, saveRunArchive, type RunArchive } from '@/db/stored-files';
import type { User } from '@/db/users';
import { downloadResponse } from '@/lib/storage/download';
import { runArchiveKey } from '@/lib/storage/keys';
import { objectStore, sha256Hex } from '@/lib/storage/object-store';

/**
 * Exported run archives (issue #13): one JSON file with what the run already stores — the cell
 * document it ran on, its event log, and its grade and trace summary — written to the bucket
 * and served back through the run's own reader checks (lib/runs/access.ts). Nothing is
 * re-simulated: the grade, breakdown and trace hash are the ones the server stored.
 *
 * What goes in follows what the reader may see (the same rules as the run routes): the drill's
 * fault cards and rules, the breakdown and the fault events only when its hidden parts are
 * visible to them, and the seed only for the drill's trainer and admins. The file carries no
 * export time or exporter, so the same view of the same run is the same bytes, named by their
 * SHA-256: exporting again stores nothing new.
 */

export const RUN_ARCHIVE_FORMAT = 'cellwright-run-archive';
export const RUN_ARCHIVE_VERSION = 1;

/** The archive's content for this reader. */
export async function buildRunArchive(run: Run, reader: RunReader, hiddenVisible: boolean): Promise<Record<string, unknown>> {
  const version = await getVersion(run.cellId, run.cellVersion);
  if (!version) throw new Error(`run ${run.id}: cell version ${run.cellId}@${run.cellVersion} is missing`);
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  const log = await storedLog(run.id);
  const view = runView(run, hiddenVisible, reader);
  return {
    format: RUN_ARCHIVE_FORMAT,
    version: RUN_ARCHIVE_VERSION,
    hiddenIncluded: hiddenVisible,
    run: view,
    drill: drill
      ? {
          id: drill.id,
          title: drill.title,
          timeLimitMs: drill.timeLimitMs,
          ...(hiddenVisible ? { faults: drill.faults, rules: drill.rules, answer: drill.answer, diagnosisWeight: drill.diagnosisWeight } : {}),
        }
      : null,
    cell: { id: run.cellId, version: run.cellVersion, document: version.document },
    log: { untilMs: run.endedMs ?? log.untilMs, batches: log.lastSeq, events: hiddenVisible ? log.events : sanitiseEvents(log.events) },
    summary: {
      status: run.status,
      grade: view.grade,
      computedGrade: view.computedGrade,
      overridden: view.overridden,
      overrideReason: view.overrideReason,
      diagnosis: run.diagnosis,
      endedMs: run.endedMs,
      traceHash: run.traceHash,
      breakdown: hiddenVisible ? run.breakdown : null,
    },
  };
}

/** What the archive route answers about an archive. */
export function archiveView(a: RunArchive) {
  return { id: a.id, sizeBytes: a.sizeBytes, sha256: a.sha256, hiddenIncluded: a.hiddenIncluded, createdAt: a.createdAt, url: `/api/runs/${a.runId}/archive/${a.id}` };
}

/** Exports the run as `user` may see it: the file in the bucket (once per distinct content) and its row. */
export async function exportRunArchive(user: User, run: Run, reader: RunReader, hiddenVisible: boolean): Promise<RunArchive> {
  const bytes = Buffer.from(`${JSON.stringify(await buildRunArchive(run, reader, hiddenVisible), null, 2)}\n`, 'utf8');
  const sha256 = sha256Hex(bytes);
  const key = runArchiveKey(run.id, sha256);
  const stored = await objectStore().put(key, bytes, 'application/json');
  return saveRunArchive({ runId: run.id, objectKey: stored.key, sizeBytes: stored.sizeBytes, sha256, hiddenIncluded: hiddenVisible, createdBy: user.id });
}

/**
 * One archive, for a reader of its run: the drill's trainer and admins may download any; the
 * run's owner only those the owner made (never one made by staff, which holds the seed), and one
 * with hidden parts only while those are visible to them. Anything else is 404, like a missing id.
 */
export async function runArchiveDownload(run: Run, reader: RunReader, hiddenVisible: boolean, archiveId: string): Promise<Response> {
  const archive = await findRunArchive(run.id, archiveId);
  const allowed = archive && (reader !== 'owner' || (archive.createdBy === run.userId && (!archive.hiddenIncluded || hiddenVisible)));
  if (!archive || !allowed) throw new ApiError(404, 'No such archive.');
  return downloadResponse({
    objectKey: archive.objectKey,
    contentType: 'application/json',
    fileName: `run-${run.id.slice(0, 8)}-${archive.sha256.slice(0, 12)}.json`,
    immutable: true,
  });
}
