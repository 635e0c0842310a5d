import type { Metadata } from 'next';
import Link from 'next/link';
import { PlayCircle } from 'lucide-react';
import { Card, PageHeader } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { formatDateTime } from '@/lib/format';
import { GradeBreakdown } from '@/components/runs/grade-breakdown';
import { formatCellTime, humanise } from '@/components/workspace/format';
import type { RunInfo } from '@/components/runs/types';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { runForReader, runView } from '@/lib/runs/access';
import { runIdParamSchema } from '@/lib/schemas/runs';
import { findDrill } from '@/db/drills';
import { findCell } from '@/db/cells';
import { KeepScenarioButton } from '@/components/changeovers/keep-scenario-button';
import { RunArchiveButton } from '@/components/runs/archive-button';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Run · Cellwright' };

/** A run's result: the grade the server computed (or the override), its breakdown where it may be seen, and the replay link. */
export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user } = await requirePageUser(`/runs/${raw.id}`);
  const { id } = paramsOrNotFound(runIdParamSchema, raw);
  const found = await loadOrNotFound(runForReader(user, id));
  const run = runView(found.run, found.hiddenVisible, found.reader) as RunInfo;
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  const title = drill ? drill.title : 'Free practice';
  // A lead or trainer keeps a finished run of a cell they own as one of its scenarios.
  const cell = run.status === 'submitted' && ROLE_TABLE.cellEvidence.includes(user.role) ? await findCell(run.cellId) : null;
  const keep = cell && cell.ownerId === user.id ? cell : null;
  return (
    <>
      <PageHeader
        title={title}
        description={`${run.mode === 'drill' ? 'Drill run' : 'Practice run'} by ${run.userName} · started ${formatDateTime(run.startedAt)}`}
        actions={
          <div className="flex flex-wrap items-start gap-2">
            <RunArchiveButton runId={run.id} />
            {keep ? <KeepScenarioButton runId={run.id} cellName={keep.name} suggestedName={`${title} — ${run.userName}, ${run.startedAt.slice(0, 10)}`} /> : null}
            <Link href={`/runs/${run.id}/replay`} className="inline-flex items-center gap-2 rounded-md bg-accent-700 px-3 py-2 text-sm font-medium text-white hover:bg-accent-800">
              <PlayCircle aria-hidden className="h-4 w-4" /> Replay
            </Link>
          </div>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[1fr_2fr]">
        <Card title="Result">
          {run.status === 'active' ? (
            <Notice>This run has not been submitted yet.</Notice>
          ) : run.mode === 'drill' ? (
            <div className="space-y-2">
              <p className="text-4xl font-semibold text-slate-900" data-testid="run-grade">
                {run.grade === null ? '—' : `${run.grade}%`}
              </p>
              {run.overridden ? (
                <p className="text-sm text-amber-900">
                  Set by your trainer (computed {run.computedGrade ?? '—'}%): {run.overrideReason}
                </p>
              ) : (
                <p className="text-xs text-slate-500">Computed by the server from its own replay of your run.</p>
              )}
            </div>
          ) : (
            <p className="text-sm text-slate-600">Practice runs are not graded.</p>
          )}
          <dl className="mt-4 grid grid-cols-[8rem_1fr] gap-y-1 text-sm">
            <dt className="text-slate-500">Status</dt>
            <dd>{run.status}</dd>
            <dt className="text-slate-500">Cell time</dt>
            <dd className="font-mono">{formatCellTime(run.endedMs ?? run.untilMs)}</dd>
            {run.diagnosis ? (
              <>
                <dt className="text-slate-500">Diagnosis</dt>
                <dd data-testid="run-diagnosis">
                  {humanise(run.diagnosis.kind)} at <span className="font-mono">{run.diagnosis.location}</span>
                  {run.diagnosis.note ? <span className="mt-1 block whitespace-pre-line text-slate-600" data-testid="run-diagnosis-note">{run.diagnosis.note}</span> : null}
                </dd>
              </>
            ) : null}
            <dt className="text-slate-500">Trace hash</dt>
            <dd className="truncate font-mono text-xs">{run.traceHash ?? '—'}</dd>
          </dl>
        </Card>
        <Card title="Breakdown">
          {run.breakdown ? (
            <GradeBreakdown breakdown={run.breakdown} />
          ) : run.mode === 'drill' && run.status === 'submitted' ? (
            <p className="text-sm text-slate-600">The breakdown names the drill&apos;s hidden rules; it shows here once the drill has closed.</p>
          ) : (
            <p className="text-sm text-slate-600">No breakdown for this run.</p>
          )}
        </Card>
      </div>
    </>
  );
}
