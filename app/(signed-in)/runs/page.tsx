import type { Metadata } from 'next';
import Link from 'next/link';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { formatDateTime } from '@/components/ui/format';
import { formatCellTime } from '@/components/workspace/format';
import { requirePageUser } from '@/lib/auth/session';
import { CELL_ROLES } from '@/lib/cells/roles';
import { listRunsOfUser } from '@/db/runs';
import { findDrill } from '@/db/drills';
import { listCellsSharedWithMember } from '@/db/cells';
import { ListTable } from '@/components/ui/list-table';

export const metadata: Metadata = { title: 'Runs · Cellwright' };

/** My runs, drills and free practice, newest first, each with its replay; and the shared cells to practise on. */
export default async function RunsPage() {
  const { user, allowed } = await requirePageUser('/runs', CELL_ROLES);
  if (!allowed) return <Refused role={user.role} needs="students, trainers and maintenance leads" />;
  const [runs, shared] = await Promise.all([listRunsOfUser(user.id), user.role === 'student' ? listCellsSharedWithMember(user.id) : Promise.resolve([])]);
  const drillIds = [...new Set(runs.map((r) => r.drillId).filter((x): x is string => Boolean(x)))];
  const drills = new Map((await Promise.all(drillIds.map((id) => findDrill(id, { includeDeleted: true })))).filter(Boolean).map((d) => [d!.id, d!.title]));
  return (
    <>
      <PageHeader title="Runs" description="Every run is saved as you go and can be replayed: drill attempts and free practice." />
      <div className="space-y-6">
        {shared.length > 0 ? (
          <Card title="Practise on a shared cell">
            <ul className="flex flex-wrap gap-2">
              {shared.map((c) => (
                <li key={c.id}>
                  <Link href={`/runs/practice/${c.id}`} className="inline-flex rounded-md border border-slate-300 bg-white px-3 py-1.5 text-sm hover:bg-slate-100" data-testid="practice-link">
                    Practice: {c.name}
                  </Link>
                </li>
              ))}
            </ul>
          </Card>
        ) : null}
        <Card title="My runs">
          <ListTable
            data-testid="runs-table"
            empty={runs.length === 0 && 'No runs yet.'}
            head={
              <>
                <th className="py-2">Run</th>
                <th>Started</th>
                <th>Cell time</th>
                <th>Status</th>
                <th className="text-right">Grade</th>
                <th />
              </>
            }
          >
            {runs.map((r) => (
              <tr key={r.id}>
                <td className="py-2">
                  <Link href={`/runs/${r.id}`} className="font-medium text-accent-700 hover:underline">
                    {r.drillId ? (drills.get(r.drillId) ?? 'Drill') : 'Free practice'}
                  </Link>
                  <span className="block text-xs text-slate-500">{r.mode === 'drill' ? 'drill attempt' : 'practice'}</span>
                </td>
                <td className="font-mono text-xs">{formatDateTime(r.startedAt)}</td>
                <td className="font-mono text-xs">{formatCellTime(r.endedMs ?? r.untilMs)}</td>
                <td>{r.status}</td>
                <td className="text-right font-mono">{r.mode === 'drill' && r.status === 'submitted' ? `${r.overrideGrade ?? r.grade ?? '—'}%` : '—'}</td>
                <td className="text-right">
                  <Link href={`/runs/${r.id}/replay`} className="text-xs text-accent-700 hover:underline">
                    Replay
                  </Link>
                </td>
              </tr>
            ))}
          </ListTable>
        </Card>
      </div>
    </>
  );
}
