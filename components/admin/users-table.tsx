'use client';

import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import type { SortingState } from '@tanstack/react-table';
import { useEffect, useMemo, useState } from 'react';
import { ArrowDown, ArrowUp, ChevronLeft, ChevronRight, Search } from 'lucide-react';
import { fetchJson } from '@/lib/api/client';
import { ROLES, ROLE_LABELS } from '@/lib/roles';
import type { Role } from '@/lib/roles';
import type { USER_SORTS } from '@/lib/schemas/admin';
import type { User as UserRow } from '@/lib/users/types';
import { Button } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';

interface UsersPage {
  users: UserRow[];
  total: number;
  page: number;
  pageSize: number;
}

type SortKey = (typeof USER_SORTS)[number];
const SORT_BY_COLUMN: Record<string, SortKey> = { name: 'name', email: 'email', role: 'role', lastSignInAt: 'last_sign_in_at', createdAt: 'created_at' };

const column = createColumnHelper<UserRow>();

/** Admin user table: search, sort and paging happen on the server; role and disabled changes are audited there. */
export function UsersTable({ currentUserId }: { currentUserId: string }) {
  const queryClient = useQueryClient();
  const [search, setSearch] = useState('');
  const [q, setQ] = useState('');
  const [sorting, setSorting] = useState<SortingState>([{ id: 'name', desc: false }]);
  const [pagination, setPagination] = useState({ pageIndex: 0, pageSize: 10 });

  // Wait for a pause in typing before asking the server.
  useEffect(() => {
    const t = setTimeout(() => {
      setQ(search.trim());
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    }, 250);
    return () => clearTimeout(t);
  }, [search]);

  const sort = sorting[0] ? SORT_BY_COLUMN[sorting[0].id] ?? 'name' : 'name';
  const dir = sorting[0]?.desc ? 'desc' : 'asc';
  const params = new URLSearchParams({ sort, dir, page: String(pagination.pageIndex + 1), pageSize: String(pagination.pageSize) });
  if (q) params.set('q', q);
  const query = useQuery({
    queryKey: ['admin-users', q, sort, dir, pagination.pageIndex, pagination.pageSize],
    queryFn: () => fetchJson<UsersPage>(`/api/admin/users?${params.toString()}`),
    placeholderData: keepPreviousData,
  });

  const update = useMutation({
    mutationFn: ({ id, change }: { id: string; change: { role?: Role; disabled?: boolean } }) =>
      fetchJson(`/api/admin/users/${id}`, { method: 'PATCH', body: change }),
    onSettled: () => void queryClient.invalidateQueries({ queryKey: ['admin-users'] }),
  });

  const columns = useMemo(
    () => [
      column.accessor('name', { header: 'Name', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      column.accessor('email', { header: 'E-mail', cell: (c) => <span className="font-mono text-xs">{c.getValue()}</span> }),
      column.accessor('role', {
        header: 'Role',
        cell: (c) => {
          const u = c.row.original;
          return (
            <select
              aria-label={`Role of ${u.name}`}
              value={u.role}
              disabled={u.id === currentUserId || update.isPending}
              onChange={(e) => update.mutate({ id: u.id, change: { role: e.target.value as Role } })}
              className="rounded-md border border-slate-300 bg-white px-2 py-1 text-sm"
            >
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </select>
          );
        },
      }),
      column.accessor('lastSignInAt', { header: 'Last sign-in', cell: (c) => <span className="font-mono text-xs">{formatDateTime(c.getValue())}</span> }),
      column.accessor('createdAt', { header: 'Created', cell: (c) => <span className="font-mono text-xs">{formatDateTime(c.getValue())}</span> }),
      column.display({
        id: 'status',
        header: 'Status',
        cell: (c) => {
          const u = c.row.original;
          return (
            <Button
              variant={u.disabled ? 'secondary' : 'danger'}
              disabled={u.id === currentUserId || update.isPending}
              aria-label={`${u.disabled ? 'Enable' : 'Disable'} ${u.name}`}
              onClick={() => update.mutate({ id: u.id, change: { disabled: !u.disabled } })}
            >
              {u.disabled ? 'Enable' : 'Disable'}
            </Button>
          );
        },
      }),
    ],
    [currentUserId, update],
  );

  const data = query.data;
  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table returns functions React Compiler cannot memoize; this component is not compiled.
  const table = useReactTable({
    data: data?.users ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: data?.total ?? 0,
    state: { sorting, pagination },
    onSortingChange: (updater) => {
      setSorting(updater);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    enableSortingRemoval: false,
  });

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <label className="relative block">
          <span className="sr-only">Search users</span>
          <Search aria-hidden className="pointer-events-none absolute left-2 top-2.5 h-4 w-4 text-slate-400" />
          <input
            type="search"
            placeholder="Search name or e-mail"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            className="w-72 rounded-md border border-slate-300 bg-white py-2 pl-8 pr-3 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30"
          />
        </label>
        <span className="text-sm text-slate-600" data-testid="user-total">
          {data ? `${data.total} user${data.total === 1 ? '' : 's'}` : ''}
        </span>
      </div>
      {query.error ? <Notice tone="error">{query.error.message}</Notice> : null}
      {update.error ? <Notice tone="error">{update.error.message}</Notice> : null}
      <div className="relative overflow-x-auto rounded-lg border border-slate-200 bg-white shadow-sm">
        <table className="w-full text-left text-sm" aria-label="Users">
          <thead className="border-b border-slate-200 bg-slate-50 text-xs uppercase tracking-wide text-slate-500">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sortable = h.column.id in SORT_BY_COLUMN;
                  const sorted = h.column.getIsSorted();
                  return (
                    <th key={h.id} className="px-3 py-2" aria-sort={sorted ? (sorted === 'desc' ? 'descending' : 'ascending') : undefined}>
                      {sortable ? (
                        <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase">
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          {sorted === 'asc' ? <ArrowUp aria-hidden className="h-3 w-3" /> : null}
                          {sorted === 'desc' ? <ArrowDown aria-hidden className="h-3 w-3" /> : null}
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-slate-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={row.original.disabled ? 'bg-slate-50 text-slate-500' : undefined}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {data && data.users.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-slate-500">
                  No users match.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <div className="flex items-center justify-end gap-2 text-sm">
        <span className="text-slate-600">
          Page {pagination.pageIndex + 1} of {Math.max(1, table.getPageCount())}
        </span>
        <Button variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()} aria-label="Previous page">
          <ChevronLeft aria-hidden className="h-4 w-4" />
        </Button>
        <Button variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()} aria-label="Next page">
          <ChevronRight aria-hidden className="h-4 w-4" />
        </Button>
      </div>
    </div>
  );
}
