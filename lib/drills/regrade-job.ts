import 'server-only';
import { isDeepStrictEqual } from 'node:util';
import { z } from 'zod';
import { findDrill } from '@/db/drills';
import { listSubmittedRunsOfDrill, type Run } from '@/db/runs';
import { regrade } from '@/lib/runs/service';
import { PermanentJobError } from '@/lib/jobs/errors';
import type { JobContext } from '@/lib/jobs/handler';
import type { DrillRegradeReport, RegradeDifference } from './regrade-report';

/**
 * The `drill-regrade` job: re-simulates every submitted run of a drill from its stored event
 * log with the same grader the submit used (lib/runs/service.ts `regrade`, on the engine's
 * worker threads) and compares grade, breakdown and trace hash with what was stored. The
 * stored grades are never written: the report says whether the server's grading reproduces.
 * Safe to run again from the start (it only reads).
 */

const payloadSchema = z.object({ drillId: z.uuid() });

/** JSON as PostgreSQL's jsonb keeps it (no undefined members), so stored and fresh values compare fairly. */
function asStored(value: unknown): unknown {
  return value === undefined ? null : JSON.parse(JSON.stringify(value));
}

async function checkRun(run: Run): Promise<{ kind: 'matched' } | { kind: 'differed'; diff: RegradeDifference }> {
  if (run.endedMs === null) throw new Error('the run has no stored end time');
  const now = await regrade(run, run.diagnosis, run.endedMs);
  const breakdownChanged = !isDeepStrictEqual(asStored(now.breakdown), asStored(run.breakdown));
  if (now.grade === run.grade && now.traceHash === run.traceHash && !breakdownChanged) return { kind: 'matched' };
  return {
    kind: 'differed',
    diff: {
      runId: run.id,
      student: run.userName,
      stored: { grade: run.grade, traceHash: run.traceHash },
      now: { grade: now.grade, traceHash: now.traceHash },
      breakdownChanged,
    },
  };
}

/** The handler (lib/jobs/registry.ts). */
export async function drillRegradeJob(payload: unknown, ctx: JobContext): Promise<DrillRegradeReport> {
  const parsed = payloadSchema.safeParse(payload);
  if (!parsed.success) throw new PermanentJobError('A drill regrade needs a drill id.');
  const { drillId } = parsed.data;
  if (!(await findDrill(drillId, { includeDeleted: true }))) throw new PermanentJobError('The drill no longer exists.');
  const runs = await listSubmittedRunsOfDrill(drillId);
  const report: DrillRegradeReport = { drillId, runs: runs.length, matched: 0, differed: [], failed: [], checkedAt: '' };
  await ctx.reportProgress(0, runs.length, runs.length === 0 ? 'No submitted runs to check' : `Checking ${runs.length} submitted run${runs.length === 1 ? '' : 's'}`);
  for (const [i, run] of runs.entries()) {
    if (ctx.signal.aborted) throw ctx.signal.reason;
    try {
      const out = await checkRun(run);
      if (out.kind === 'matched') report.matched += 1;
      else report.differed.push(out.diff);
    } catch (err) {
      // One run that does not replay is reported, not a reason to stop checking the others.
      report.failed.push({ runId: run.id, student: run.userName, error: err instanceof Error ? err.message.slice(0, 500) : String(err) });
    }
    await ctx.reportProgress(i + 1, runs.length, `Run ${i + 1} of ${runs.length} (${run.userName})`);
  }
  if (runs.length > 0) await ctx.reportProgress(runs.length, runs.length, `Checked ${runs.length} run${runs.length === 1 ? '' : 's'}: ${report.matched} matched`);
  report.checkedAt = new Date().toISOString();
  return report;
}
