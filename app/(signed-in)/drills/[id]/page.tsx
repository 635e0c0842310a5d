import type { Metadata } from 'next';
import Link from 'next/link';
import { Eye } from 'lucide-react';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { formatDateTime } from '@/lib/format';
import { DrillEditor } from '@/components/drills/drill-editor';
import { AssignForm } from '@/components/drills/assign-form';
import { DrillRegrade } from '@/components/drills/drill-regrade';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { assignmentState, drillForAuthor } from '@/lib/drills/access';
import { drillAsInput } from '@/lib/drills/author';
import { drillIdParamSchema } from '@/lib/schemas/drills';
import { drillHasRuns, listAssignmentsOfDrill } from '@/db/drills';
import { findCell, listOwnedCells } from '@/db/cells';
import { listJobs, subjectOf } from '@/lib/jobs';
import { listCohorts } from '@/db/cohorts';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Drill · Cellwright' };

/** The drill editor, its preview, and its assignments (the drill's trainer, or an admin). */
export default async function DrillPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/drills/${raw.id}`, ROLE_TABLE.drills);
  if (!allowed) return <Refused role={user.role} needs="trainers" />;
  const { id } = paramsOrNotFound(drillIdParamSchema, raw);
  const drill = await loadOrNotFound(drillForAuthor(user, id));
  const [owned, assignments, cohorts, locked, base, jobs] = await Promise.all([
    listOwnedCells(drill.trainerId),
    listAssignmentsOfDrill(drill.id),
    listCohorts(user.role === 'admin' ? null : user.id),
    drillHasRuns(drill.id),
    findCell(drill.cellId),
    listJobs(subjectOf('drill', drill.id)),
  ]);
  const cells = owned.map((c) => ({ id: c.id, name: c.name, versionCount: c.versionCount }));
  if (base && !cells.some((c) => c.id === base.id)) cells.unshift({ id: base.id, name: base.name, versionCount: drill.cellVersion });
  return (
    <>
      <PageHeader
        title={drill.title}
        description={`Drill by ${drill.trainerName} · updated ${formatDateTime(drill.updatedAt)}`}
        actions={
          <Link href={`/drills/${drill.id}/preview`} className="inline-flex items-center gap-2 rounded-md border border-slate-300 bg-white px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100" data-testid="preview-drill">
            <Eye aria-hidden className="h-4 w-4" /> Preview as student
          </Link>
        }
      />
      <div className="space-y-6">
        <DrillEditor drillId={drill.id} initial={{ ...drillAsInput(drill), id: drill.id }} cells={cells} locked={locked} />
        <Card title="Assign to a cohort">
          <AssignForm drillId={drill.id} cohorts={cohorts.map((c) => ({ id: c.id, name: c.name, memberCount: c.memberCount }))} />
        </Card>
        <Card title="Regrade check">
          <DrillRegrade drillId={drill.id} initial={jobs.find((j) => j.kind === 'drill-regrade') ?? null} />
        </Card>
        <Card title="Assignments of this drill">
          {assignments.length === 0 ? (
            <p className="text-sm text-slate-500">Not assigned yet.</p>
          ) : (
            <ul className="divide-y divide-slate-100 text-sm" data-testid="drill-assignments">
              {assignments.map((a) => (
                <li key={a.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                  <span>
                    <span className="font-medium">{a.cohortName}</span> · {assignmentState(a)}
                  </span>
                  <span className="font-mono text-xs text-slate-500">
                    {formatDateTime(a.opensAt)} → {formatDateTime(a.closesAt)}
                  </span>
                  <span className="flex gap-3">
                    <Link href={`/drills/assignments/${a.id}/live`} className="text-accent-700 hover:underline">
                      {assignmentState(a) === 'closed' ? 'What the cohort found' : 'Live board'}
                    </Link>
                    <Link href={`/gradebook?cohort=${a.cohortId}`} className="text-accent-700 hover:underline">
                      Gradebook
                    </Link>
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </>
  );
}
