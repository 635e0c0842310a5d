import type { Metadata } from 'next';
import { CohortList } from '@/components/cohorts/cohort-list';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Cohorts · Cellwright' };

export default async function CohortsPage() {
  const { user, allowed } = await requirePageUser('/cohorts', ROLE_TABLE.cohorts);
  if (!allowed) return <Refused role={user.role} needs="trainers and administrators" />;
  return (
    <>
      <PageHeader title="Cohorts" description="Your classes of students. Invite students by e-mail; each invitation link works once." />
      <CohortList showTrainer={user.role === 'admin'} />
    </>
  );
}
