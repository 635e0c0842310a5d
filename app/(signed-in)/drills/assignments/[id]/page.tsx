import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { Refused } from '@/components/ui/refused';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/card';
import { DrillAttempt } from '@/components/drills/drill-attempt';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { assignmentForStudent, studentDrillPayload } from '@/lib/drills/access';
import { assignmentIdParamSchema, DIAGNOSIS_KINDS } from '@/lib/schemas/drills';
import { getVersion } from '@/db/cells';
import { findRunOfAssignment } from '@/db/runs';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Drill attempt · Cellwright' };

/**
 * A student's attempt at an assigned drill (the e-mail links here). The page gets exactly what
 * the student API returns (brief, objectives, permissions, the base cell), never fault cards.
 */
export default async function DrillAttemptPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/drills/assignments/${raw.id}`, ROLE_TABLE.attemptDrills);
  if (!allowed) return <Refused role={user.role} needs="students (trainers preview drills from the drill editor)" />;
  const { id } = paramsOrNotFound(assignmentIdParamSchema, raw);
  const found = await loadOrNotFound(assignmentForStudent(user, id));
  const payload = await studentDrillPayload(found.assignment, found.drill);
  const version = await getVersion(found.drill.cellId, found.drill.cellVersion);
  if (!version) notFound();
  const existing = await findRunOfAssignment(found.assignment.id, user.id);

  if (payload.state === 'upcoming') {
    return (
      <>
        <PageHeader title={payload.drill.title} description="Drill attempt" />
        <Notice>This drill opens {new Date(payload.opensAt).toUTCString()}.</Notice>
      </>
    );
  }
  if (payload.state === 'closed' && !existing) {
    return (
      <>
        <PageHeader title={payload.drill.title} description="Drill attempt" />
        <Notice>This drill closed {new Date(payload.closesAt).toUTCString()} before you started it.</Notice>
      </>
    );
  }
  if (existing && (existing.status !== 'active' || payload.state === 'closed')) {
    return (
      <>
        <PageHeader title={payload.drill.title} description="Drill attempt" />
        <Notice>
          {existing.status === 'active' ? 'This drill has closed.' : 'You have submitted this drill.'}{' '}
          <a className="font-medium text-accent-700 underline" href={`/runs/${existing.id}`}>
            See your run
          </a>
        </Notice>
      </>
    );
  }
  return <DrillAttempt payload={{ ...payload, diagnosisKinds: DIAGNOSIS_KINDS }} document={version.document} />;
}
