'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { fetchJson } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Dialog } from './dialog';
import type { CellSummaryDto, ShareOptionsDto } from './types';

/** Share a cell with cohorts (trainer: own cohorts; lead: any) and stop sharing. */
export function ShareDialog({ cell, onClose }: { cell: CellSummaryDto | null; onClose: () => void }) {
  const queryClient = useQueryClient();
  const [cohortId, setCohortId] = useState('');
  const key = ['cells', cell?.id, 'shares'];
  const options = useQuery({ queryKey: key, enabled: cell !== null, queryFn: () => fetchJson<ShareOptionsDto>(`/api/cells/${cell!.id}/shares`) });
  const refresh = () => {
    void queryClient.invalidateQueries({ queryKey: ['cells'] });
  };
  const add = useMutation({
    mutationFn: (id: string) => fetchJson(`/api/cells/${cell!.id}/shares`, { method: 'POST', body: { cohortId: id } }),
    onSuccess: () => {
      setCohortId('');
      refresh();
    },
  });
  const remove = useMutation({ mutationFn: (id: string) => fetchJson(`/api/cells/${cell!.id}/shares/${id}`, { method: 'DELETE' }), onSuccess: refresh });
  const shared = new Set(options.data?.shares.map((s) => s.cohortId));
  const available = options.data?.cohorts.filter((c) => !shared.has(c.cohortId)) ?? [];
  const failure = add.error ?? remove.error ?? options.error;
  return (
    <Dialog title={`Share “${cell?.name ?? ''}”`} open={cell !== null} onClose={onClose}>
      <div className="space-y-4 text-sm">
        {failure ? <Notice tone="error">{failure.message}</Notice> : null}
        <p className="text-slate-600">Students of a cohort see the cell in their list and open their own copy; your cell stays as it is.</p>
        <div>
          <h3 className="mb-1 font-medium">Shared with</h3>
          {options.data && options.data.shares.length === 0 ? <p className="text-slate-500">No cohort yet.</p> : null}
          <ul className="divide-y divide-slate-100">
            {options.data?.shares.map((s) => (
              <li key={s.cohortId} className="flex items-center justify-between py-2">
                <span>{s.cohortName}</span>
                <Button variant="ghost" onClick={() => remove.mutate(s.cohortId)} disabled={remove.isPending} aria-label={`Stop sharing with ${s.cohortName}`}>
                  Stop sharing
                </Button>
              </li>
            ))}
          </ul>
        </div>
        <form
          className="flex items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (cohortId) add.mutate(cohortId);
          }}
        >
          <div className="flex-1 space-y-1">
            <label htmlFor="share-cohort" className="block font-medium text-slate-700">
              Cohort
            </label>
            <select
              id="share-cohort"
              value={cohortId}
              onChange={(e) => setCohortId(e.target.value)}
              className="block w-full rounded-md border border-slate-300 bg-white px-3 py-2 focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30"
            >
              <option value="">Choose a cohort…</option>
              {available.map((c) => (
                <option key={c.cohortId} value={c.cohortId}>
                  {c.cohortName} ({c.memberCount} members)
                </option>
              ))}
            </select>
          </div>
          <Button type="submit" disabled={!cohortId || add.isPending}>
            Share
          </Button>
        </form>
      </div>
    </Dialog>
  );
}
