import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CohortDetail } from '@/components/cohorts/cohort-detail';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { canManageCohort } from '@/lib/cohorts/access';
import { findCohort } from '@/db/cohorts';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Cohort · Cellwright' };

export default async function CohortPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { user, allowed } = await requirePageUser(`/cohorts/${id}`, ROLE_TABLE.cohorts);
  if (!allowed) return <Refused role={user.role} needs="trainers and administrators" />;
  const cohort = await findCohort(id);
  if (!cohort) notFound();
  if (!canManageCohort(user, cohort)) return <Refused role={user.role} needs="the cohort's own trainer" />;
  return <CohortDetail cohortId={id} />;
}
