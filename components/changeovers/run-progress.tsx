'use client';
/**
 * A proofs or checks job under way, live: the job queue's progress stream (subject
 * `changeover:<id>`) drives the bar, one step per rule or scenario and side; when the job
 * finishes the evidence is read again at once. Until the stream has heard of the job (or where
 * it cannot connect) the run row's own progress, read with the evidence, stands in.
 */
import { useEffect } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { JobProgress } from '@/components/jobs/job-progress';
import { useJobStream } from '@/components/jobs/use-job-stream';
import { isFinished, subjectOf } from '@/lib/jobs/types';
import type { EvidenceRun } from '@/db/changeover-evidence';
import { evidenceKey } from './use-evidence';

export function RunProgress({ changeoverId, run, what }: { changeoverId: string; run: EvidenceRun; what: string }) {
  const stream = useJobStream(run.jobId ? subjectOf('changeover', changeoverId) : null);
  const job = stream.jobs.find((j) => j.id === run.jobId);
  const qc = useQueryClient();
  const finished = job ? isFinished(job.state) : false;
  useEffect(() => {
    if (finished) void qc.invalidateQueries({ queryKey: evidenceKey(changeoverId) });
  }, [finished, qc, changeoverId]);

  if (job) return <JobProgress job={job} label={`${what} job`} className="rounded-md border border-accent-200 bg-accent-50/50 px-3 py-2" />;
  const pct = run.total > 0 ? Math.round((100 * run.done) / run.total) : 0;
  return (
    <div className="space-y-1 rounded-md border border-accent-200 bg-accent-50/50 px-3 py-2" data-testid="job-progress" data-state={run.status}>
      <p role="status" aria-live="polite" className="text-sm font-medium text-slate-900">
        {what} job: {run.status === 'queued' ? 'Waiting for a worker' : 'Running'}
      </p>
      <div role="progressbar" aria-label={`${what} job`} aria-valuemin={0} aria-valuemax={run.total || undefined} aria-valuenow={run.total ? run.done : undefined} className="h-3 overflow-hidden rounded-full border border-slate-300 bg-slate-100">
        <div className="h-full rounded-full bg-accent-700 transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      <p className="flex flex-wrap justify-between gap-2 text-xs text-slate-600">
        <span className="font-mono">{run.total ? `${run.done} of ${run.total}` : ''}</span>
        {run.current ? <span>{run.current}</span> : null}
      </p>
    </div>
  );
}
