'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Copy, Download, FileSpreadsheet, FolderOpen, Pencil, Play, Plus, Share2, Trash2 } from 'lucide-react';
import { fetchJson } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';
import { CreateCellDialog, DeleteCellDialog, RenameCellDialog } from './cell-dialogs';
import { CsvImportDialog } from './csv-import-dialog';
import { JsonImport } from './json-import';
import { ShareDialog } from './share-dialog';
import { practiceHref, sharedPracticeTarget } from './practice';
import type { CellSummaryDto, SharedCellDto } from './types';

type Dialogs = { kind: 'rename' | 'delete' | 'share' | 'csv'; cell: CellSummaryDto } | null;

const iconButton = 'inline-flex items-center justify-center rounded-md p-1.5 text-slate-600 hover:bg-slate-100 hover:text-slate-900 disabled:opacity-40';

function ExportMenu({ cell }: { cell: CellSummaryDto }) {
  const base = `/api/cells/${cell.id}`;
  return (
    <details className="relative">
      <summary className={`${iconButton} cursor-pointer list-none`} aria-label={`Export ${cell.name}`} title="Export">
        <Download aria-hidden className="h-4 w-4" />
      </summary>
      <ul className="absolute right-0 z-10 mt-1 w-48 rounded-md border border-slate-200 bg-white py-1 text-sm shadow-lg">
        <li>
          <a className="block px-3 py-1.5 hover:bg-slate-100" href={`${base}/export`} download>
            Cell (JSON)
          </a>
        </li>
        <li>
          <a className="block px-3 py-1.5 hover:bg-slate-100" href={`${base}/csv/point-map`} download>
            Point map (CSV)
          </a>
        </li>
        <li>
          <a className="block px-3 py-1.5 hover:bg-slate-100" href={`${base}/csv/io-list`} download>
            I/O list (CSV)
          </a>
        </li>
      </ul>
    </details>
  );
}

/** The user's own cells (shared copies included) with their actions. */
export function MyCells({ cells, canShare, open }: { cells: CellSummaryDto[]; canShare: boolean; open: (d: Dialogs) => void }) {
  const queryClient = useQueryClient();
  const duplicate = useMutation({
    mutationFn: (id: string) => fetchJson(`/api/cells/${id}/duplicate`, { method: 'POST', body: {} }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: ['cells'] }),
  });
  if (cells.length === 0) return <p className="text-sm text-slate-500">No cells yet. Create one from a template, or import one.</p>;
  return (
    <div className="relative overflow-x-auto">
      {duplicate.error ? <Notice tone="error">{duplicate.error.message}</Notice> : null}
      <table className="w-full text-left text-sm" data-testid="my-cells">
        <caption className="sr-only">My cells</caption>
        <thead className="border-b border-slate-200 text-xs uppercase tracking-wide text-slate-500">
          <tr>
            <th scope="col" className="py-2 pr-3">
              Name
            </th>
            <th scope="col" className="px-3 py-2">
              Owner
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Versions
            </th>
            <th scope="col" className="px-3 py-2">
              Updated
            </th>
            <th scope="col" className="px-3 py-2">
              Shared with
            </th>
            <th scope="col" className="py-2 pl-3 text-right">
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-slate-100">
          {cells.map((c) => (
            <tr key={c.id} data-testid="cell-row" data-cell-id={c.id}>
              <td className="py-2 pr-3">
                <Link href={`/cells/${c.id}`} className="font-medium text-accent-700 hover:underline">
                  {c.name}
                </Link>
                {c.origin === 'shared-copy' ? <span className="ml-2 rounded bg-slate-100 px-1.5 py-0.5 text-xs text-slate-600">my copy</span> : null}
              </td>
              <td className="whitespace-nowrap px-3 py-2 text-slate-700">{c.ownerName}</td>
              <td className="px-3 py-2 text-right font-mono" data-testid="cell-version-count">
                {c.versionCount}
              </td>
              <td className="whitespace-nowrap px-3 py-2 font-mono text-xs text-slate-600">{formatDateTime(c.updatedAt)}</td>
              <td className="px-3 py-2 text-slate-700">{c.sharedWith.length ? c.sharedWith.map((s) => s.cohortName).join(', ') : <span className="text-slate-400">—</span>}</td>
              <td className="py-2 pl-3">
                <div className="flex items-center justify-end gap-0.5">
                  <Link href={practiceHref(c.id)} className={iconButton} aria-label={`Practice ${c.name}`} title="Practice (recorded run)">
                    <Play aria-hidden className="h-4 w-4" />
                  </Link>
                  <button type="button" className={iconButton} aria-label={`Rename ${c.name}`} title="Rename" onClick={() => open({ kind: 'rename', cell: c })}>
                    <Pencil aria-hidden className="h-4 w-4" />
                  </button>
                  <button type="button" className={iconButton} aria-label={`Duplicate ${c.name}`} title="Duplicate" disabled={duplicate.isPending} onClick={() => duplicate.mutate(c.id)}>
                    <Copy aria-hidden className="h-4 w-4" />
                  </button>
                  {canShare ? (
                    <button type="button" className={iconButton} aria-label={`Share ${c.name}`} title="Share with a cohort" onClick={() => open({ kind: 'share', cell: c })}>
                      <Share2 aria-hidden className="h-4 w-4" />
                    </button>
                  ) : null}
                  <button type="button" className={iconButton} aria-label={`Import CSV into ${c.name}`} title="Import CSV" onClick={() => open({ kind: 'csv', cell: c })}>
                    <FileSpreadsheet aria-hidden className="h-4 w-4" />
                  </button>
                  <ExportMenu cell={c} />
                  <button type="button" className={`${iconButton} hover:text-red-700`} aria-label={`Delete ${c.name}`} title="Delete" onClick={() => open({ kind: 'delete', cell: c })}>
                    <Trash2 aria-hidden className="h-4 w-4" />
                  </button>
                </div>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Cells shared with the student's cohorts: open or practise on the student's own copy. */
export function SharedWithMe({ shared }: { shared: SharedCellDto[] }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const copy = useMutation({
    // A student works on a copy of a shared cell; `then` says where to go once it exists.
    mutationFn: ({ id }: { id: string; then: 'open' | 'practice' }) => fetchJson<{ cell: { id: string } }>(`/api/cells/${id}/copy`, { method: 'POST' }),
    onSuccess: (data, { then }) => {
      void queryClient.invalidateQueries({ queryKey: ['cells'] });
      router.push(then === 'practice' ? practiceHref(data.cell.id) : `/cells/${data.cell.id}`);
    },
  });
  return (
    <Card title="Shared with my cohort">
      {copy.error ? <Notice tone="error">{copy.error.message}</Notice> : null}
      {shared.length === 0 ? <p className="text-sm text-slate-500">Nothing shared with your cohorts yet.</p> : null}
      <ul className="divide-y divide-slate-100" data-testid="shared-cells">
        {shared.map((s) => {
          const practice = sharedPracticeTarget(s);
          return (
            <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
              <div>
                <p className="font-medium text-slate-900">{s.name}</p>
                <p className="text-xs text-slate-600">
                  from {s.ownerName} · {s.cohorts.map((c) => c.cohortName).join(', ')} · version <span className="font-mono">{s.latestVersion}</span>
                </p>
              </div>
              <div className="flex flex-wrap items-center gap-2">
                {practice.kind === 'link' ? (
                  <Link
                    href={practice.href}
                    aria-label={`Practice ${s.name}`}
                    className="inline-flex items-center gap-2 rounded-md border border-slate-300 px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100"
                  >
                    <Play aria-hidden className="h-4 w-4" />
                    Practice
                  </Link>
                ) : (
                  <button
                    type="button"
                    onClick={() => copy.mutate({ id: s.id, then: 'practice' })}
                    disabled={copy.isPending}
                    aria-label={`Practice ${s.name}`}
                    title="Makes your copy, then opens a recorded practice run on it"
                    className="inline-flex items-center gap-2 rounded-md border border-slate-300 px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100 disabled:opacity-40"
                  >
                    <Play aria-hidden className="h-4 w-4" />
                    Practice
                  </button>
                )}
                {s.myCopyId ? (
                  <Link href={`/cells/${s.myCopyId}`} className="inline-flex items-center gap-2 rounded-md border border-slate-300 px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100">
                    <FolderOpen aria-hidden className="h-4 w-4" />
                    Go to my copy
                  </Link>
                ) : (
                  <Button onClick={() => copy.mutate({ id: s.id, then: 'open' })} disabled={copy.isPending} aria-label={`Open my copy of ${s.name}`}>
                    <FolderOpen aria-hidden className="h-4 w-4" />
                    Open my copy
                  </Button>
                )}
              </div>
            </li>
          );
        })}
      </ul>
    </Card>
  );
}

/** The cells list: my cells with their actions, and for students the cells shared with their cohorts. */
export function CellsList({ canShare, isStudent }: { canShare: boolean; isStudent: boolean }) {
  const query = useQuery({ queryKey: ['cells'], queryFn: () => fetchJson<{ cells: CellSummaryDto[]; shared: SharedCellDto[] }>('/api/cells') });
  const [creating, setCreating] = useState(false);
  const [dialog, setDialog] = useState<Dialogs>(null);
  const close = () => setDialog(null);
  // The freshest row for the dialog: after an import the list refetches and the next base version follows.
  const pick = (kind: NonNullable<Dialogs>['kind']) =>
    dialog?.kind === kind ? (query.data?.cells.find((c) => c.id === dialog.cell.id) ?? dialog.cell) : null;
  return (
    <div className="space-y-6">
      {isStudent && query.data ? <SharedWithMe shared={query.data.shared} /> : null}
      <Card
        title="My cells"
        actions={
          <div className="flex flex-wrap items-start gap-2">
            <JsonImport />
            <Button onClick={() => setCreating(true)}>
              <Plus aria-hidden className="h-4 w-4" />
              New cell
            </Button>
          </div>
        }
      >
        {query.isPending ? <p className="text-sm text-slate-500">Loading…</p> : null}
        {query.error ? <Notice tone="error">{query.error.message}</Notice> : null}
        {query.data ? <MyCells cells={query.data.cells} canShare={canShare} open={setDialog} /> : null}
        <p className="mt-4 text-xs text-slate-500">
          CSV templates:{' '}
          <a href="/api/cells/csv-templates/point-map" className="text-accent-700 hover:underline" download>
            point map
          </a>{' '}
          ·{' '}
          <a href="/api/cells/csv-templates/io-list" className="text-accent-700 hover:underline" download>
            I/O list
          </a>
        </p>
      </Card>
      <CreateCellDialog open={creating} onClose={() => setCreating(false)} />
      <RenameCellDialog cell={pick('rename')} onClose={close} />
      <DeleteCellDialog cell={pick('delete')} onClose={close} />
      {canShare ? <ShareDialog cell={pick('share')} onClose={close} /> : null}
      <CsvImportDialog cell={pick('csv')} onClose={close} />
    </div>
  );
}
