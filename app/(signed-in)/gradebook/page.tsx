import type { Metadata } from 'next';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { GradebookView } from '@/components/drills/gradebook';
import { requirePageUser } from '@/lib/auth/session';
import { listCohorts } from '@/db/cohorts';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Gradebook · Cellwright' };

/** Cohort × drill grades for the cohort's trainer (admins: every cohort). */
export default async function GradebookPage({ searchParams }: { searchParams: Promise<{ cohort?: string }> }) {
  const { user, allowed } = await requirePageUser('/gradebook', ROLE_TABLE.drills);
  if (!allowed) return <Refused role={user.role} needs="trainers" />;
  const cohorts = await listCohorts(user.role === 'admin' ? null : user.id);
  const { cohort } = await searchParams;
  const current = cohorts.find((c) => c.id === cohort)?.id ?? cohorts[0]?.id ?? '';
  return (
    <>
      <PageHeader title="Gradebook" description="Grades come from the server's own replay of each run. An override needs a reason and is recorded in the audit log." />
      {cohorts.length === 0 ? (
        <p className="text-sm text-slate-500">You have no cohorts yet.</p>
      ) : (
        <GradebookView cohorts={cohorts.map((c) => ({ id: c.id, name: c.name }))} cohortId={current} />
      )}
    </>
  );
}
