import 'server-only';
import { ApiError, busy } from '@/lib/api/errors';
import { enqueueJob, listJobs, subjectOf, type JobRecord } from '@/lib/jobs';
import type { Changeover } from '@/lib/changeovers/types';
import { findSignedRecord } from '@/db/changeovers';
import { findChangeoverReport } from '@/db/stored-files';
import { downloadResponse } from '@/lib/storage/download';
import { changeoverReportFileName } from './changeover-report-name';

/**
 * The printed changeover report as the app serves it. The PDF is made off the request, by the
 * `changeover-report` job (changeover-report-job.ts), queued when the changeover is
 * countersigned; the download route only streams the stored file, through the reader checks of
 * the record route.
 */

const REPORT_KIND = 'changeover-report';

/** The report job of a changeover still waiting or running, if any. */
async function pendingReportJob(changeoverId: string): Promise<JobRecord | undefined> {
  return (await listJobs(subjectOf('changeover', changeoverId))).find((j) => j.kind === REPORT_KIND && (j.state === 'queued' || j.state === 'running'));
}

/** Queues the report of a signed-off changeover unless one is already on its way. */
export async function queueChangeoverReport(changeoverId: string, ownerId: string): Promise<JobRecord> {
  return (await pendingReportJob(changeoverId)) ?? enqueueJob({ kind: REPORT_KIND, payload: { changeoverId }, ownerId, subject: subjectOf('changeover', changeoverId) });
}

/** Whether the report of a changeover is stored (the page offers the download, or says it is being printed). */
export async function changeoverReportReady(changeoverId: string): Promise<boolean> {
  return (await findChangeoverReport(changeoverId)) !== null;
}

/**
 * The download of a readable changeover's report: 404 before sign-off; 503 with Retry-After
 * while it is being printed (a report that is neither stored nor on its way, after a failed job
 * or from before reports existed, is queued again here).
 */
export async function changeoverReportDownload(co: Changeover, readerId: string): Promise<Response> {
  const record = await findSignedRecord(co.id);
  if (!record) throw new ApiError(404, 'This changeover has no signed record yet, so it has no printed report.');
  const report = await findChangeoverReport(co.id);
  if (!report) {
    await queueChangeoverReport(co.id, readerId);
    throw busy('The printed report is being made; try again in a few seconds.', 5);
  }
  return downloadResponse({ objectKey: report.objectKey, contentType: 'application/pdf', fileName: changeoverReportFileName(record), immutable: true });
}
