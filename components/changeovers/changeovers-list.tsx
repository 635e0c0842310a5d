'use client';

import { useQuery } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import Link from 'next/link';
import { useMemo, useState } from 'react';
import { ArrowDown, ArrowUp, Plus } from 'lucide-react';
import { fetchJson } from '@/lib/api/client';
import type { Changeover } from '@/lib/changeovers/types';
import { Button } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';
import { OpenChangeoverDialog, type OwnCell } from './open-changeover-dialog';
import { STATE_LABELS, StateBadge, displayState } from './state-badge';

const column = createColumnHelper<Changeover>();

/**
 * Every changeover the person may read, newest change first; sorting happens here (the list is
 * short: one person's changeovers). Leads and trainers open new ones on their own cells.
 */
export function ChangeoversList({ initial, cells, canOpen }: { initial: Changeover[]; cells: OwnCell[]; canOpen: boolean }) {
  const query = useQuery({
    queryKey: ['changeovers'],
    queryFn: () => fetchJson<{ changeovers: Changeover[] }>('/api/changeovers'),
    initialData: { changeovers: initial },
  });
  const [opening, setOpening] = useState(false);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'updatedAt', desc: true }]);

  const columns = useMemo(
    () => [
      column.accessor('title', {
        header: 'Changeover',
        cell: (c) => (
          <Link href={`/changeovers/${c.row.original.id}`} className="font-medium text-accent-700 hover:underline">
            {c.getValue()}
          </Link>
        ),
      }),
      column.accessor((r) => STATE_LABELS[displayState(r)].label, {
        id: 'state',
        header: 'State',
        cell: (c) => <StateBadge changeover={c.row.original} />,
      }),
      column.accessor('cellName', {
        header: 'Cell',
        cell: (c) => (
          <span>
            {c.getValue()}{' '}
            <span className="whitespace-nowrap font-mono text-xs text-slate-500">
              v{c.row.original.baseVersion} → v{c.row.original.proposedVersion}
              {c.row.original.pinnedVersion === null && c.row.original.state === 'drafting' ? ' (latest)' : ''}
            </span>
          </span>
        ),
      }),
      column.accessor((r) => r.openedBy.name, { id: 'openedBy', header: 'Opened by', cell: (c) => <span className="whitespace-nowrap">{c.getValue()}</span> }),
      column.accessor('createdAt', { header: 'Opened', cell: (c) => <span className="whitespace-nowrap font-mono text-xs text-slate-600">{formatDateTime(c.getValue())}</span> }),
      column.accessor('updatedAt', { header: 'Last change', cell: (c) => <span className="whitespace-nowrap font-mono text-xs text-slate-600">{formatDateTime(c.getValue())}</span> }),
    ],
    [],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table returns functions React Compiler cannot memoize; this component is not compiled.
  const table = useReactTable({
    data: query.data.changeovers,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    enableSortingRemoval: false,
  });

  return (
    <div className="space-y-4">
      {canOpen ? (
        <div className="flex justify-end">
          <Button onClick={() => setOpening(true)} data-testid="open-changeover">
            <Plus aria-hidden className="h-4 w-4" /> Open a changeover
          </Button>
        </div>
      ) : null}
      {query.error ? <Notice tone="error">{query.error.message}</Notice> : null}
      {query.data.changeovers.length === 0 ? (
        <p className="rounded-lg border border-dashed border-slate-300 bg-white p-6 text-sm text-slate-600">
          No changeovers yet.{' '}
          {canOpen ? 'Open one on a cell you keep: the version that runs today is its base, and you edit the proposal in the workspace.' : 'Changeovers you are asked to countersign appear here.'}
        </p>
      ) : (
        <div className="relative overflow-x-auto rounded-lg border border-slate-200 bg-white shadow-sm">
          <table className="w-full text-left text-sm" aria-label="Changeovers" data-testid="changeovers-table">
            <thead className="border-b border-slate-200 bg-slate-50 text-xs uppercase tracking-wide text-slate-500">
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const sorted = h.column.getIsSorted();
                    return (
                      <th key={h.id} scope="col" className="px-3 py-2" aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}>
                        <button type="button" className="inline-flex items-center gap-1 uppercase tracking-wide hover:text-slate-800" onClick={h.column.getToggleSortingHandler()}>
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          {sorted === 'asc' ? <ArrowUp aria-hidden className="h-3 w-3" /> : sorted === 'desc' ? <ArrowDown aria-hidden className="h-3 w-3" /> : null}
                        </button>
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody className="divide-y divide-slate-100">
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} data-testid="changeover-row" data-changeover-id={row.original.id}>
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="px-3 py-2 align-top">
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canOpen ? <OpenChangeoverDialog open={opening} onClose={() => setOpening(false)} cells={cells} /> : null}
    </div>
  );
}
