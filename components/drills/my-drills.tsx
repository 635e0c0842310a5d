import Link from 'next/link';
import { formatDateTime } from '@/lib/format';
import { cn } from '@/components/ui/cn';
import { assignmentState } from '@/lib/drills/access';
import { listAssignmentsForStudent } from '@/db/drills';
import { listDrillRunsOfUser } from '@/db/runs';
import { ListTable } from '@/components/ui/list-table';

const STATE_STYLE = { upcoming: 'bg-slate-100 text-slate-700', open: 'bg-accent-50 text-accent-800 ring-1 ring-accent-200', closed: 'bg-slate-200 text-slate-700' } as const;

/** A student's assigned drills: open or closed, their run, their grade (server component). */
export async function MyDrillsTable({ userId, compact = false }: { userId: string; compact?: boolean }) {
  const [assignments, runs] = await Promise.all([listAssignmentsForStudent(userId), listDrillRunsOfUser(userId)]);
  const byAssignment = new Map(runs.filter((r) => r.assignmentId).map((r) => [r.assignmentId!, r]));
  return (
    <ListTable
      data-testid="my-drills"
      empty={assignments.length === 0 && 'No drills assigned to you yet.'}
      head={
        <>
          <th className="py-2">Drill</th>
          <th>State</th>
          {compact ? null : <th>Closes</th>}
          <th className="text-right">Grade</th>
        </>
      }
    >
      {assignments.map((a) => {
        const state = assignmentState(a);
        const run = byAssignment.get(a.id);
        const grade = run ? (run.overrideGrade ?? run.grade) : null;
        const submitted = run?.status === 'submitted';
        return (
          <tr key={a.id} data-testid={`my-drill-${a.id}`}>
            <td className="py-2">
              {submitted || (state === 'closed' && run) ? (
                <Link href={`/runs/${run!.id}`} className="font-medium text-accent-700 hover:underline">
                  {a.drillTitle}
                </Link>
              ) : state === 'open' ? (
                <Link href={`/drills/assignments/${a.id}`} className="font-medium text-accent-700 hover:underline">
                  {a.drillTitle}
                </Link>
              ) : (
                <span className="font-medium">{a.drillTitle}</span>
              )}
              <span className="block text-xs text-slate-500">{a.cohortName}</span>
            </td>
            <td>
              <span className={cn('rounded px-1.5 py-0.5 text-xs', STATE_STYLE[state])}>{submitted ? 'submitted' : run && state === 'open' ? 'in progress' : state}</span>
            </td>
            {compact ? null : <td className="font-mono text-xs">{formatDateTime(a.closesAt)}</td>}
            <td className="text-right font-mono">{submitted && grade !== null ? `${grade}%` : '—'}</td>
          </tr>
        );
      })}
    </ListTable>
  );
}
