'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useRef, useState } from 'react';
import { Upload } from 'lucide-react';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import type { CellSummaryDto } from './types';

/** Import a cell exported as JSON; a document that does not fit the cell schema lists every problem by path. */
export function JsonImport() {
  const queryClient = useQueryClient();
  const input = useRef<HTMLInputElement>(null);
  const [problems, setProblems] = useState<[string, string][]>([]);
  const [failure, setFailure] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const mutation = useMutation({
    mutationFn: (document: unknown) => fetchJson<{ cell: CellSummaryDto }>('/api/cells/import', { method: 'POST', body: { document } }),
    onSuccess: (data) => {
      setDone(`Imported “${data.cell.name}”.`);
      void queryClient.invalidateQueries({ queryKey: ['cells'] });
    },
    onError: (err) => {
      setFailure(err instanceof ApiClientError ? err.message : 'The server could not be reached. Try again.');
      if (err instanceof ApiClientError) setProblems(Object.entries(err.fields ?? {}).flatMap(([path, msgs]) => msgs.map((m) => [path === '_' ? '(document)' : path, m] as [string, string])));
    },
  });
  const onFile = async (file: File | undefined) => {
    setProblems([]);
    setFailure(null);
    setDone(null);
    if (!file) return;
    let document: unknown;
    try {
      document = JSON.parse(await file.text());
    } catch {
      setFailure(`${file.name} is not a JSON file.`);
      return;
    }
    mutation.mutate(document);
  };
  return (
    <div className="space-y-2">
      <input
        ref={input}
        type="file"
        accept=".json,application/json"
        className="sr-only"
        aria-label="Cell JSON file to import"
        data-testid="json-import-input"
        onChange={(e) => {
          void onFile(e.target.files?.[0]);
          e.target.value = '';
        }}
      />
      <Button variant="secondary" onClick={() => input.current?.click()} disabled={mutation.isPending}>
        <Upload aria-hidden className="h-4 w-4" />
        Import JSON
      </Button>
      {done ? <Notice tone="success">{done}</Notice> : null}
      {failure ? (
        <Notice tone="error">
          <p>{failure}</p>
          {problems.length > 0 ? (
            <ul className="mt-1 list-disc space-y-0.5 pl-4" data-testid="json-import-problems">
              {problems.map(([path, m], i) => (
                <li key={i}>
                  <span className="font-mono">{path}</span>: {m}
                </li>
              ))}
            </ul>
          ) : null}
        </Notice>
      ) : null}
    </div>
  );
}
