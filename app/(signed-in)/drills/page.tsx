import type { Metadata } from 'next';
import Link from 'next/link';
import { Plus } from 'lucide-react';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { formatDateTime } from '@/lib/format';
import { MyDrillsTable } from '@/components/drills/my-drills';
import { requirePageUser } from '@/lib/auth/session';
import { assignmentState } from '@/lib/drills/access';
import { listAssignmentsOfTrainer, listDrills } from '@/db/drills';
import { ListTable } from '@/components/ui/list-table';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Drills · Cellwright' };

/** Students: the drills assigned to them. Trainers (admins): their drills, a new one, their assignments. */
export default async function DrillsPage() {
  const { user, allowed } = await requirePageUser('/drills', ROLE_TABLE.assignments);
  if (!allowed) return <Refused role={user.role} needs="students and trainers" />;
  if (user.role === 'student') {
    return (
      <>
        <PageHeader title="My drills" description="Drills your trainer assigned to your cohort. The work is saved as you go; submit your diagnosis before a drill closes." />
        <Card>
          <MyDrillsTable userId={user.id} />
        </Card>
      </>
    );
  }
  const [drills, assignments] = await Promise.all([listDrills(user.role === 'admin' ? null : user.id), listAssignmentsOfTrainer(user.role === 'admin' ? null : user.id)]);
  return (
    <>
      <PageHeader
        title="Drills"
        description="Hide fault cards in a cell, write the brief and the grading rules, preview it as a student, and assign it to a cohort."
        actions={
          <Link href="/drills/new" className="inline-flex items-center gap-2 rounded-md bg-accent-700 px-3 py-2 text-sm font-medium text-white hover:bg-accent-800" data-testid="new-drill">
            <Plus aria-hidden className="h-4 w-4" /> New drill
          </Link>
        }
      />
      <div className="space-y-6">
        <Card title="Your drills">
          <ListTable
            data-testid="drills-table"
            empty={drills.length === 0 && 'No drills yet.'}
            head={
              <>
                <th className="py-2">Drill</th>
                <th>Faults</th>
                <th>Rules</th>
                <th>Time limit</th>
                <th>Updated</th>
              </>
            }
          >
            {drills.map((d) => (
              <tr key={d.id}>
                <td className="py-2">
                  <Link href={`/drills/${d.id}`} className="font-medium text-accent-700 hover:underline">
                    {d.title}
                  </Link>
                  {d.libraryKey ? <span className="ml-2 rounded bg-slate-100 px-1.5 text-xs text-slate-600">library</span> : null}
                </td>
                <td className="font-mono">{d.faults.length}</td>
                <td className="font-mono">{d.rules.length}</td>
                <td className="font-mono">{Math.round(d.timeLimitMs / 60_000)} min</td>
                <td className="font-mono text-xs text-slate-500">{formatDateTime(d.updatedAt)}</td>
              </tr>
            ))}
          </ListTable>
        </Card>
        <Card title="Assignments">
          <ListTable
            data-testid="assignments-table"
            empty={assignments.length === 0 && 'Nothing assigned yet.'}
            head={
              <>
                <th className="py-2">Drill</th>
                <th>Cohort</th>
                <th>Opens</th>
                <th>Closes</th>
                <th>State</th>
              </>
            }
          >
            {assignments.map((a) => (
              <tr key={a.id}>
                <td className="py-2">
                  <Link href={`/drills/${a.drillId}`} className="text-accent-700 hover:underline">
                    {a.drillTitle}
                  </Link>
                </td>
                <td>
                  <Link href={`/gradebook?cohort=${a.cohortId}`} className="hover:underline">
                    {a.cohortName}
                  </Link>
                </td>
                <td className="font-mono text-xs">{formatDateTime(a.opensAt)}</td>
                <td className="font-mono text-xs">{formatDateTime(a.closesAt)}</td>
                <td>{assignmentState(a)}</td>
              </tr>
            ))}
          </ListTable>
        </Card>
      </div>
    </>
  );
}
