import 'server-only';
import { PermanentJobError, type JobHandler } from '@/lib/jobs';
import { findSignedRecord } from '@/db/changeovers';
import { findChangeoverReport, saveChangeoverReport, type StoredFile } from '@/db/stored-files';
import { changeoverReportKey } from '@/lib/storage/keys';
import { objectStore } from '@/lib/storage/object-store';
import { renderChangeoverReport } from './changeover-report';

/**
 * The `changeover-report` job (queued at countersignature, lib/changeovers/sign-off.ts, and
 * again by the download route when a report is missing): renders the signed record as a PDF in
 * the worker process, stores it in the bucket and records it. Safe to run again: a report that
 * is recorded and present is left as it is; otherwise the same record renders to the same
 * bytes under the same key.
 */

export type ChangeoverReportPayload = { changeoverId: string };

export async function makeChangeoverReport(changeoverId: string): Promise<StoredFile & { made: boolean }> {
  const existing = await findChangeoverReport(changeoverId);
  if (existing && (await objectStore().exists(existing.objectKey))) return { ...existing, made: false };
  const record = await findSignedRecord(changeoverId);
  if (!record) throw new PermanentJobError('the changeover has no signed record');
  const bytes = await renderChangeoverReport(record);
  const stored = await objectStore().put(changeoverReportKey(changeoverId), bytes, 'application/pdf');
  await saveChangeoverReport(changeoverId, { objectKey: stored.key, sizeBytes: stored.sizeBytes, sha256: stored.sha256 });
  return { ...(await findChangeoverReport(changeoverId))!, made: true };
}

/** The queue's handler (lib/jobs/registry.ts). */
export const changeoverReportJob: JobHandler = async (payload, ctx) => {
  const p = payload as Partial<ChangeoverReportPayload> | null;
  if (!p || typeof p.changeoverId !== 'string') throw new PermanentJobError('the job names no changeover');
  await ctx.reportProgress(0, 1, 'Printing the signed record');
  const file = await makeChangeoverReport(p.changeoverId);
  await ctx.reportProgress(1, 1, 'Printed');
  return { sizeBytes: file.sizeBytes, sha256: file.sha256, made: file.made };
};
