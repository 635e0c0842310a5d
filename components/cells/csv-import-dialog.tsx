'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Download } from 'lucide-react';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import type { CsvKind } from '@/lib/schemas/cells';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Dialog } from './dialog';
import type { CellSummaryDto, CsvRowErrorDto } from './types';

const KIND_TEXT: Record<CsvKind, { label: string; effect: string }> = {
  'point-map': { label: 'Point map', effect: 'The rows become the controller’s staged point map: they go live after a controller restart.' },
  'io-list': { label: 'I/O list', effect: 'The rows replace the cell’s wiring.' },
};

/** The API's `rows.<row>.<column>` field errors back as a table of row, column, message. */
function rowErrorsFrom(fields: Record<string, string[]> | undefined): CsvRowErrorDto[] {
  const out: CsvRowErrorDto[] = [];
  for (const [key, messages] of Object.entries(fields ?? {})) {
    const m = /^rows\.(\d+)\.(.+)$/.exec(key);
    if (!m) continue;
    for (const message of messages) out.push({ row: Number(m[1]), column: m[2] === '_' ? '' : m[2], message });
  }
  return out.sort((a, b) => a.row - b.row);
}

/**
 * Import a point map or I/O list from CSV into a cell as a new version. A file with any bad
 * row is refused whole; every row's problem is listed so the file can be fixed in one pass.
 */
export function CsvImportDialog({ cell, onClose }: { cell: CellSummaryDto | null; onClose: () => void }) {
  const queryClient = useQueryClient();
  const [kind, setKind] = useState<CsvKind>('point-map');
  const [file, setFile] = useState<File | null>(null);
  const [rowErrors, setRowErrors] = useState<CsvRowErrorDto[]>([]);
  const [failure, setFailure] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const reset = () => {
    setRowErrors([]);
    setFailure(null);
    setDone(null);
  };
  const close = () => {
    reset();
    setFile(null);
    onClose();
  };
  const mutation = useMutation({
    mutationFn: async () => {
      const csv = await file!.text();
      return fetchJson<{ version: { version: number }; count: number }>(`/api/cells/${cell!.id}/csv/${kind}`, {
        method: 'POST',
        body: { baseVersion: cell!.latestVersion, csv },
      });
    },
    onSuccess: (data) => {
      setDone(`Imported ${data.count} row${data.count === 1 ? '' : 's'} as version ${data.version.version}.`);
      void queryClient.invalidateQueries({ queryKey: ['cells'] });
    },
    onError: (err) => {
      if (err instanceof ApiClientError) {
        setFailure(err.message);
        setRowErrors(rowErrorsFrom(err.fields));
        if (err.status === 409) void queryClient.invalidateQueries({ queryKey: ['cells'] });
      } else setFailure('The server could not be reached. Try again.');
    },
  });
  return (
    <Dialog title={`Import CSV into “${cell?.name ?? ''}”`} open={cell !== null} onClose={close} wide>
      <form
        className="space-y-4 text-sm"
        onSubmit={(e) => {
          e.preventDefault();
          reset();
          if (file) mutation.mutate();
        }}
      >
        <fieldset className="flex flex-wrap gap-4">
          <legend className="mb-1 font-medium text-slate-700">What the file holds</legend>
          {(Object.keys(KIND_TEXT) as CsvKind[]).map((k) => (
            <label key={k} className="flex items-center gap-2">
              <input type="radio" name="csv-kind" value={k} checked={kind === k} onChange={() => setKind(k)} className="accent-accent-700" />
              {KIND_TEXT[k].label}
            </label>
          ))}
        </fieldset>
        <p className="text-slate-600">
          {KIND_TEXT[kind].effect} The import is saved as a new version on top of version <span className="font-mono">{cell?.latestVersion}</span>.{' '}
          <a href={`/api/cells/csv-templates/${kind}`} className="inline-flex items-center gap-1 font-medium text-accent-700 hover:underline" download>
            <Download aria-hidden className="h-3.5 w-3.5" />
            {KIND_TEXT[kind].label} template
          </a>
        </p>
        <div className="space-y-1">
          <label htmlFor="csv-file" className="block font-medium text-slate-700">
            CSV file
          </label>
          <input
            id="csv-file"
            type="file"
            accept=".csv,text/csv"
            onChange={(e) => {
              reset();
              setFile(e.target.files?.[0] ?? null);
            }}
            className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-slate-300 file:bg-white file:px-3 file:py-1.5 file:text-sm"
          />
        </div>
        {done ? <Notice tone="success">{done}</Notice> : null}
        {failure ? <Notice tone="error">{failure}</Notice> : null}
        {rowErrors.length > 0 ? (
          <div className="max-h-72 overflow-auto rounded-md border border-red-200">
            <table className="w-full text-left text-sm" data-testid="csv-row-errors">
              <caption className="sr-only">Problems in the file, by row</caption>
              <thead className="sticky top-0 bg-red-50 text-xs uppercase tracking-wide text-red-900">
                <tr>
                  <th scope="col" className="px-3 py-2">
                    Row
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Column
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Problem
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-red-100">
                {rowErrors.map((e, i) => (
                  <tr key={i} data-testid="csv-row-error" data-row={e.row}>
                    <td className="px-3 py-1.5 font-mono">{e.row}</td>
                    <td className="px-3 py-1.5 font-mono">{e.column || '—'}</td>
                    <td className="px-3 py-1.5">{e.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={close}>
            {done ? 'Close' : 'Cancel'}
          </Button>
          <Button type="submit" disabled={!file || mutation.isPending}>
            Import
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
