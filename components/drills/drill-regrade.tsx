'use client';
import { useState } from 'react';
import { RefreshCcw } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ListTable } from '@/components/ui/list-table';
import { formatDateTime } from '@/lib/format';
import { JobProgress } from '@/components/jobs/job-progress';
import { useJobStream } from '@/components/jobs/use-job-stream';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import type { DrillRegradeReport } from '@/lib/drills/regrade-report';
import { isFinished, type JobRecord } from '@/lib/jobs/types';

const short = (hash: string | null) => (hash ? hash.slice(0, 12) : '—');
const gradeText = (g: number | null) => (g === null ? '—' : String(g));

function Report({ report }: { report: DrillRegradeReport }) {
  const clean = report.differed.length === 0 && report.failed.length === 0;
  return (
    <div className="space-y-3" data-testid="regrade-report">
      <Notice tone={clean ? 'success' : 'error'}>
        {report.runs === 0
          ? 'This drill has no submitted runs yet.'
          : clean
            ? `All ${report.runs} submitted run${report.runs === 1 ? '' : 's'} re-simulated to the grade and trace stored at submission.`
            : `${report.matched} of ${report.runs} submitted runs matched; ${report.differed.length} differed${report.failed.length ? `, ${report.failed.length} could not be re-simulated` : ''}.`}{' '}
        Checked {formatDateTime(report.checkedAt)}.
      </Notice>
      {report.differed.length > 0 ? (
        <ListTable
          aria-label="Runs whose regrade differs from the stored grade"
          head={
            <>
              <th className="py-2 pr-3">Student</th>
              <th className="py-2 pr-3">Stored grade</th>
              <th className="py-2 pr-3">Regrade</th>
              <th className="py-2 pr-3">Stored trace</th>
              <th className="py-2 pr-3">Regrade trace</th>
              <th className="py-2">Breakdown</th>
            </>
          }
        >
          {report.differed.map((d) => (
            <tr key={d.runId}>
              <td className="py-2 pr-3">{d.student}</td>
              <td className="py-2 pr-3 font-mono">{gradeText(d.stored.grade)}</td>
              <td className="py-2 pr-3 font-mono">{gradeText(d.now.grade)}</td>
              <td className="py-2 pr-3 font-mono text-xs">{short(d.stored.traceHash)}</td>
              <td className="py-2 pr-3 font-mono text-xs">{short(d.now.traceHash)}</td>
              <td className="py-2">{d.breakdownChanged ? 'changed' : 'same'}</td>
            </tr>
          ))}
        </ListTable>
      ) : null}
      {report.failed.length > 0 ? (
        <ul className="list-disc space-y-1 pl-5 text-sm text-slate-700">
          {report.failed.map((f) => (
            <li key={f.runId}>
              {f.student}: {f.error}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

/**
 * The drill page's regrade check: queue a regrade of every submitted run, follow it live, read
 * the report. The work runs in the job worker, not in this request; stored grades are never
 * changed (a trainer corrects one with a run's grade override).
 */
export function DrillRegrade({ drillId, initial }: { drillId: string; initial: JobRecord | null }) {
  const { jobs, connection, track } = useJobStream(`drill:${drillId}`, initial ? [initial] : []);
  const [posting, setPosting] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const job = jobs.find((j) => j.kind === 'drill-regrade') ?? null;
  const open = job !== null && !isFinished(job.state);

  const start = async () => {
    setPosting(true);
    setProblem(null);
    try {
      const answer = await fetchJson<{ job: JobRecord }>(`/api/drills/${drillId}/regrade`, { method: 'POST' });
      track(answer.job);
    } catch (e) {
      setProblem(e instanceof ApiClientError ? e.message : 'The regrade could not be queued.');
    } finally {
      setPosting(false);
    }
  };

  return (
    <div className="space-y-4" data-testid="drill-regrade">
      <p className="text-sm text-slate-600">
        Re-simulates every submitted run of this drill on the server from its stored event log and compares the outcome with the grade and trace
        stored at submission. It checks that grading is reproducible; stored grades are never changed.
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <Button onClick={start} disabled={posting || open} data-testid="regrade-drill">
          <RefreshCcw aria-hidden className="h-4 w-4" /> Regrade every submitted run of this drill
        </Button>
        {connection === 'lost' && open ? <span className="text-xs text-slate-500">Live updates paused; reconnecting…</span> : null}
      </div>
      {problem ? <Notice tone="error">{problem}</Notice> : null}
      {job ? <JobProgress job={job} label="Regrade check" /> : <p className="text-sm text-slate-500">No regrade check has run on this drill yet.</p>}
      {job?.state === 'done' && job.result ? <Report report={job.result as DrillRegradeReport} /> : null}
    </div>
  );
}
