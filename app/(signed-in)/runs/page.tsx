import type { Metadata } from 'next';
import Link from 'next/link';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { formatDateTime } from '@/lib/format';
import { formatCellTime } from '@/components/workspace/format';
import { requirePageUser } from '@/lib/auth/session';
import { listDrillRunsOfUser, pagePracticeRunsOfUser, type Run } from '@/db/runs';
import { findDrill } from '@/db/drills';
import { listCellsSharedWithMember } from '@/db/cells';
import { ListTable } from '@/components/ui/list-table';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Runs · Cellwright' };

/** Practice runs per page: every restart of a practice cell opens a run, so they pile up. */
const PAGE_SIZE = 25;

/** The page number from the query: a whole number from 1, anything else is page 1. */
function pageOf(raw: string | string[] | undefined): number {
  const n = Number(Array.isArray(raw) ? raw[0] : raw);
  return Number.isInteger(n) && n >= 1 ? n : 1;
}

function RunRow({ run, title, note, grade }: { run: Run; title: string; note: string; grade: string }) {
  return (
    <tr>
      <td className="py-2">
        <Link href={`/runs/${run.id}`} className="font-medium text-accent-700 hover:underline">
          {title}
        </Link>
        <span className="block text-xs text-slate-500">{note}</span>
      </td>
      <td className="font-mono text-xs">{formatDateTime(run.startedAt)}</td>
      <td className="font-mono text-xs">{formatCellTime(run.endedMs ?? run.untilMs)}</td>
      <td>{run.status}</td>
      <td className="text-right font-mono">{grade}</td>
      <td className="text-right">
        <Link href={`/runs/${run.id}/replay`} className="text-xs text-accent-700 hover:underline">
          Replay
        </Link>
      </td>
    </tr>
  );
}

const HEAD = (
  <>
    <th className="py-2">Run</th>
    <th>Started</th>
    <th>Cell time</th>
    <th>Status</th>
    <th className="text-right">Grade</th>
    <th />
  </>
);

/**
 * My runs, each with its replay: every drill attempt, then free practice newest first a page at
 * a time; and, for students, the shared cells to practise on.
 */
export default async function RunsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { user, allowed } = await requirePageUser('/runs', ROLE_TABLE.cells);
  if (!allowed) return <Refused role={user.role} needs="students, trainers and maintenance leads" />;
  const requested = pageOf((await searchParams).page);
  const [attempts, practice, shared] = await Promise.all([
    listDrillRunsOfUser(user.id),
    pagePracticeRunsOfUser(user.id, requested, PAGE_SIZE),
    user.role === 'student' ? listCellsSharedWithMember(user.id) : Promise.resolve([]),
  ]);
  const pages = Math.max(1, Math.ceil(practice.total / PAGE_SIZE));
  // A page past the end (runs were deleted, an old link) shows the last page instead of nothing.
  const page = Math.min(requested, pages);
  const shown = page === requested ? practice : await pagePracticeRunsOfUser(user.id, page, PAGE_SIZE);
  const drillIds = [...new Set(attempts.map((r) => r.drillId).filter((x): x is string => Boolean(x)))];
  const drills = new Map((await Promise.all(drillIds.map((id) => findDrill(id, { includeDeleted: true })))).filter(Boolean).map((d) => [d!.id, d!.title]));
  const first = (page - 1) * PAGE_SIZE + 1;
  const last = Math.min(shown.total, page * PAGE_SIZE);
  const pageLink = (n: number, label: string) =>
    n >= 1 && n <= pages && n !== page ? (
      <Link href={n === 1 ? '/runs' : `/runs?page=${n}`} className="rounded-md border border-slate-300 bg-white px-3 py-1.5 text-sm hover:bg-slate-100">
        {label}
      </Link>
    ) : (
      <span className="rounded-md border border-slate-200 px-3 py-1.5 text-sm text-slate-400" aria-disabled="true">
        {label}
      </span>
    );
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
        <Card title="Drill attempts">
          <ListTable data-testid="drill-runs-table" empty={attempts.length === 0 && 'No drill attempts yet.'} head={HEAD}>
            {attempts.map((r) => (
              <RunRow
                key={r.id}
                run={r}
                title={drills.get(r.drillId ?? '') ?? 'Drill'}
                note="drill attempt"
                grade={r.status === 'submitted' ? `${r.overrideGrade ?? r.grade ?? '—'}%` : '—'}
              />
            ))}
          </ListTable>
        </Card>
        <Card title="Free practice">
          <ListTable data-testid="runs-table" empty={shown.total === 0 && 'No practice runs yet.'} head={HEAD}>
            {shown.runs.map((r) => (
              <RunRow key={r.id} run={r} title="Free practice" note={r.cellName} grade="—" />
            ))}
          </ListTable>
          {shown.total > PAGE_SIZE ? (
            <nav className="mt-3 flex items-center gap-2" aria-label="Practice run pages">
              {pageLink(page - 1, 'Newer')}
              {pageLink(page + 1, 'Older')}
              <span className="text-xs text-slate-500" data-testid="runs-page-status">
                Runs {first}–{last} of {shown.total} · page {page} of {pages}
              </span>
            </nav>
          ) : null}
        </Card>
      </div>
    </>
  );
}
