import { cn } from '@/components/ui/cn';
import type { JobRecord } from '@/lib/jobs/types';

/** The job's state in words, as the page and screen readers say it. */
export function jobStateWords(job: Pick<JobRecord, 'state' | 'attempts' | 'error'>): string {
  switch (job.state) {
    case 'queued':
      return job.attempts > 0 ? `Waiting to try again (attempt ${job.attempts} did not finish)` : 'Waiting for a worker';
    case 'running':
      return job.attempts > 1 ? `Running (attempt ${job.attempts})` : 'Running';
    case 'done':
      return 'Finished';
    case 'failed':
      return 'Failed';
  }
}

/**
 * A job's progress: a bar with its count and note, and its state in words. The bar is a
 * `progressbar` (value and range when the total is known, indeterminate before); the state
 * line is a polite live region, so a screen reader hears each change of state without being
 * told every step.
 */
export function JobProgress({ job, label, className }: { job: JobRecord; label: string; className?: string }) {
  const { done, total, note } = job.progress;
  const known = total > 0;
  const finished = job.state === 'done' || job.state === 'failed';
  const pct = known ? Math.round((Math.min(done, total) / total) * 100) : job.state === 'done' ? 100 : 0;
  const count = known ? `${done} of ${total}` : job.state === 'running' ? 'Starting' : '';
  const valueText = [count, note].filter(Boolean).join(' — ') || jobStateWords(job);
  return (
    <div className={cn('space-y-2', className)} data-testid="job-progress" data-state={job.state}>
      <p role="status" aria-live="polite" className="text-sm font-medium text-slate-800">
        {label}: <span data-testid="job-state">{jobStateWords(job)}</span>
      </p>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={known ? total : undefined}
        aria-valuenow={known ? Math.min(done, total) : undefined}
        aria-valuetext={valueText}
        className="h-3 w-full overflow-hidden rounded-full border border-slate-300 bg-slate-100"
      >
        <div
          className={cn(
            'h-full rounded-full transition-[width] duration-300',
            job.state === 'failed' ? 'bg-slate-500' : 'bg-accent-700',
            !known && !finished && job.state === 'running' && 'w-1/3 motion-safe:animate-pulse',
          )}
          style={known || finished ? { width: `${pct}%` } : undefined}
        />
      </div>
      <p className="flex flex-wrap justify-between gap-2 text-xs text-slate-600">
        <span className="font-mono" data-testid="job-count">
          {count}
        </span>
        {note ? <span>{note}</span> : null}
      </p>
      {job.error ? (
        <p className={cn('text-sm', job.state === 'failed' ? 'text-red-800' : 'text-slate-600')} data-testid="job-error">
          {job.state === 'failed' ? job.error : `Last attempt: ${job.error}`}
        </p>
      ) : null}
    </div>
  );
}
