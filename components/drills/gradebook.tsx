'use client';
/**
 * The trainer's gradebook: one row per student, one column per assigned drill (TanStack
 * Table), a per-student detail with replay links, CSV export, and a grade override that
 * needs a reason (the server writes it to the audit log).
 */
import { useMemo, useState } from 'react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { ArrowUpDown, Download, PenLine, PlayCircle } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { Dialog } from '@/components/cells/dialog';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { humanise } from '@/components/workspace/format';
import { ListTable } from '@/components/ui/list-table';

type GbCell = { runId: string; status: 'active' | 'submitted'; grade: number | null; computedGrade: number | null; overridden: boolean; overrideReason: string | null; submittedAt: string | null; diagnosis: { kind: string; location: string } | null } | null;
type GbRow = { studentId: string; name: string; email: string; cells: Record<string, GbCell> };
type Gradebook = {
  cohort: { id: string; name: string };
  columns: { assignmentId: string; drillId: string; drillTitle: string; opensAt: string; closesAt: string; state: string }[];
  rows: GbRow[];
};

function cellText(c: GbCell): string {
  if (!c) return '—';
  if (c.status !== 'submitted') return 'in progress';
  return c.grade === null ? '—' : `${c.grade}%`;
}

export function GradebookView({ cohorts, cohortId }: { cohorts: { id: string; name: string }[]; cohortId: string }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const q = useQuery({ queryKey: ['gradebook', cohortId], queryFn: () => fetchJson<{ gradebook: Gradebook }>(`/api/gradebook?cohort=${cohortId}`), enabled: Boolean(cohortId) });
  const book = q.data?.gradebook;
  const [sorting, setSorting] = useState<SortingState>([]);
  const [detail, setDetail] = useState<string | null>(null);
  const [override, setOverride] = useState<{ runId: string; student: string; drill: string; current: number | null } | null>(null);

  const columns = useMemo(() => {
    const h = createColumnHelper<GbRow>();
    return [
      h.accessor('name', {
        header: 'Student',
        cell: (info) => (
          <button type="button" onClick={() => setDetail(info.row.original.studentId)} className="text-left font-medium text-accent-700 hover:underline">
            {info.getValue()}
            <span className="block text-xs font-normal text-slate-500">{info.row.original.email}</span>
          </button>
        ),
      }),
      ...(book?.columns ?? []).map((col) =>
        h.accessor((r) => r.cells[col.assignmentId]?.grade ?? -1, {
          id: col.assignmentId,
          header: () => (
            <span>
              {col.drillTitle}
              <span className="block text-[10px] font-normal normal-case text-slate-600">{col.state}</span>
            </span>
          ),
          cell: (info) => {
            const c = info.row.original.cells[col.assignmentId];
            return (
              <span className={cn('font-mono', c?.overridden && 'text-amber-800')} data-testid={`grade-${info.row.original.studentId}-${col.assignmentId}`} title={c?.overridden ? `Override: ${c.overrideReason}` : undefined}>
                {cellText(c)}
                {c?.overridden ? '*' : ''}
              </span>
            );
          },
        }),
      ),
    ];
  }, [book?.columns]);

  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table returns functions React Compiler cannot memoize; this component is not compiled.
  const table = useReactTable({ data: book?.rows ?? [], columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });
  const student = book?.rows.find((r) => r.studentId === detail) ?? null;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <div className="space-y-1">
          <label htmlFor="gb-cohort" className="block text-xs font-medium text-slate-600">
            Cohort
          </label>
          <select id="gb-cohort" value={cohortId} onChange={(e) => router.push(`/gradebook?cohort=${e.target.value}`)} className="rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm">
            {cohorts.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
        {cohortId ? (
          <a href={`/api/gradebook/csv?cohort=${cohortId}`} className="inline-flex items-center gap-2 rounded-md border border-slate-300 bg-white px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100" data-testid="gradebook-csv">
            <Download aria-hidden className="h-4 w-4" /> Export CSV
          </a>
        ) : null}
      </div>
      {book && book.columns.some((c) => c.state === 'closed') ? (
        <p className="text-sm text-slate-600" data-testid="gradebook-findings">
          What the cohort found (closed drills):{' '}
          {book.columns
            .filter((c) => c.state === 'closed')
            .map((c, i) => (
              <span key={c.assignmentId}>
                {i > 0 ? ' · ' : ''}
                <a href={`/drills/assignments/${c.assignmentId}/live`} className="text-accent-700 underline hover:text-accent-900">
                  {c.drillTitle}
                </a>{' '}
                (<a href={`/api/assignments/${c.assignmentId}/findings?format=csv`} className="text-accent-700 underline hover:text-accent-900">CSV</a>)
              </span>
            ))}
        </p>
      ) : null}
      {q.isError ? <Notice tone="error">{q.error instanceof Error ? q.error.message : 'The gradebook could not be loaded.'}</Notice> : null}
      {q.isLoading ? <p className="text-sm text-slate-500">Loading…</p> : null}
      {book ? (
        book.columns.length === 0 ? (
          <p className="text-sm text-slate-500">No drills assigned to this cohort yet.</p>
        ) : (
          <div className="relative overflow-x-auto rounded-lg border border-slate-200 bg-white">
            <table className="w-full text-left text-sm" data-testid="gradebook">
              <thead className="bg-slate-50 text-xs uppercase tracking-wide text-slate-500">
                {table.getHeaderGroups().map((hg) => (
                  <tr key={hg.id}>
                    {hg.headers.map((header) => (
                      <th key={header.id} className="px-3 py-2 align-bottom">
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-start gap-1 text-left uppercase">
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <ArrowUpDown aria-hidden className="mt-0.5 h-3 w-3 shrink-0" />
                        </button>
                      </th>
                    ))}
                  </tr>
                ))}
              </thead>
              <tbody className="divide-y divide-slate-100">
                {table.getRowModel().rows.map((row) => (
                  <tr key={row.id}>
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id} className="px-3 py-2">
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="px-3 py-2 text-xs text-slate-500">* overridden by the trainer (hover for the reason). Click a student for the detail.</p>
          </div>
        )
      ) : null}

      <Dialog title={student ? `${student.name} — runs` : 'Student'} open={student !== null} onClose={() => setDetail(null)} wide>
        {student && book ? (
          <ListTable
            data-testid="student-detail"
            head={
              <>
                <th className="py-1.5">Drill</th>
                <th>Grade</th>
                <th>Diagnosis</th>
                <th />
              </>
            }
          >
            {book.columns.map((col) => {
              const c = student.cells[col.assignmentId];
              return (
                <tr key={col.assignmentId}>
                  <td className="py-1.5">{col.drillTitle}</td>
                  <td className="font-mono">
                    {cellText(c)}
                    {c?.overridden ? <span className="block text-xs font-sans text-amber-800">computed {c.computedGrade ?? '—'}% · {c.overrideReason}</span> : null}
                  </td>
                  <td className="text-xs">{c?.diagnosis ? `${humanise(c.diagnosis.kind)} at ${c.diagnosis.location}` : '—'}</td>
                  <td className="space-x-2 whitespace-nowrap text-right">
                    {c ? (
                      <>
                        <Link href={`/runs/${c.runId}`} className="text-xs text-accent-700 hover:underline">
                          Result
                        </Link>
                        <Link href={`/runs/${c.runId}/replay`} className="inline-flex items-center gap-1 text-xs text-accent-700 hover:underline" data-testid="replay-link">
                          <PlayCircle aria-hidden className="h-3.5 w-3.5" /> Replay
                        </Link>
                        {c.status === 'submitted' ? (
                          <button type="button" onClick={() => setOverride({ runId: c.runId, student: student.name, drill: col.drillTitle, current: c.grade })} className="inline-flex items-center gap-1 text-xs text-slate-700 hover:underline">
                            <PenLine aria-hidden className="h-3.5 w-3.5" /> Override
                          </button>
                        ) : null}
                      </>
                    ) : null}
                  </td>
                </tr>
              );
            })}
          </ListTable>
        ) : null}
      </Dialog>
      <OverrideDialog
        target={override}
        onClose={() => setOverride(null)}
        onDone={() => {
          setOverride(null);
          void queryClient.invalidateQueries({ queryKey: ['gradebook', cohortId] });
        }}
      />
    </div>
  );
}

function OverrideDialog({ target, onClose, onDone }: { target: { runId: string; student: string; drill: string; current: number | null } | null; onClose: () => void; onDone: () => void }) {
  const [grade, setGrade] = useState('');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const save = async (remove: boolean) => {
    setError(null);
    const g = remove ? null : Number(grade);
    if (!remove && (grade.trim() === '' || !Number.isFinite(g) || g! < 0 || g! > 100)) return setError('Give a grade from 0 to 100.');
    if (reason.trim().length < 3) return setError('Give a reason (at least 3 characters); it is kept in the audit log.');
    setBusy(true);
    try {
      await fetchJson(`/api/runs/${target!.runId}/override`, { method: 'POST', body: { grade: g, reason } });
      setGrade('');
      setReason('');
      onDone();
    } catch (e) {
      setError(e instanceof ApiClientError ? [e.message, ...Object.values(e.fields ?? {}).flat()].join(' ') : 'The override was not saved.');
    } finally {
      setBusy(false);
    }
  };
  return (
    <Dialog title="Override grade" open={target !== null} onClose={onClose}>
      {target ? (
        <div className="space-y-3" data-testid="override-dialog">
          <p className="text-sm text-slate-600">
            {target.student} · {target.drill} · now {target.current === null ? '—' : `${target.current}%`}
          </p>
          <div className="space-y-1">
            <label htmlFor="override-grade" className="block text-sm font-medium text-slate-700">
              New grade (%)
            </label>
            <input id="override-grade" type="number" min={0} max={100} step={0.1} value={grade} onChange={(e) => setGrade(e.target.value)} className="block w-full rounded-md border border-slate-300 px-3 py-2 text-sm" />
          </div>
          <div className="space-y-1">
            <label htmlFor="override-reason" className="block text-sm font-medium text-slate-700">
              Reason
            </label>
            <textarea id="override-reason" rows={3} value={reason} onChange={(e) => setReason(e.target.value)} className="block w-full rounded-md border border-slate-300 px-3 py-2 text-sm" />
          </div>
          {error ? <Notice tone="error">{error}</Notice> : null}
          <div className="flex justify-between gap-2">
            <Button variant="danger" disabled={busy} onClick={() => void save(true)}>
              Remove override
            </Button>
            <div className="flex gap-2">
              <Button variant="secondary" onClick={onClose}>
                Cancel
              </Button>
              <Button disabled={busy} onClick={() => void save(false)} data-testid="save-override">
                Save override
              </Button>
            </div>
          </div>
        </div>
      ) : null}
    </Dialog>
  );
}
