import type { Metadata } from 'next';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { LiveBoard } from '@/components/live/live-board';
import { CohortFindings } from '@/components/live/cohort-findings';
import { requirePageUser } from '@/lib/auth/session';
import { assignmentForWatcher, loadBoard } from '@/lib/live/board';
import { buildFindings } from '@/lib/live/findings';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { assignmentIdParamSchema } from '@/lib/schemas/drills';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Live board · Cellwright' };

/**
 * The live board of an assignment (its drill's trainer, or an admin): a tile per student of the
 * cohort, kept current by the board's stream; once the assignment has closed, what the cohort
 * found, in charts.
 */
export default async function LiveBoardPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/drills/assignments/${raw.id}/live`, ROLE_TABLE.drills);
  if (!allowed) return <Refused role={user.role} needs="the drill's trainer" />;
  const { id } = paramsOrNotFound(assignmentIdParamSchema, raw);
  const { assignment, drill } = await loadOrNotFound(assignmentForWatcher(user, id));
  const { board } = await loadBoard(assignment, drill);
  const findings = board.assignment.state === 'closed' ? await buildFindings(assignment, drill) : null;
  return (
    <>
      <PageHeader
        title={`Live board: ${drill.title}`}
        description={`${assignment.cohortName} · ${board.assignment.state} · closes ${new Date(assignment.closesAt).toUTCString()}. Hidden faults are shown to you, never to students.`}
      />
      <SafetyCaution compact className="mb-4" />
      <LiveBoard initial={board} />
      {findings ? (
        <div className="mt-8">
          <Card title="What the cohort found">
            <CohortFindings findings={findings} csvHref={`/api/assignments/${assignment.id}/findings?format=csv`} />
          </Card>
        </div>
      ) : null}
    </>
  );
}
