'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { fetchJson } from '@/lib/api/client';
import type { Changeover } from '@/lib/changeovers/types';
import { openChangeoverSchema, type OpenChangeoverInput } from '@/lib/schemas/changeovers';
import { Button } from '@/components/ui/button';
import { TextAreaField, TextField } from '@/components/ui/field';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';
import { Dialog } from '@/components/cells/dialog';

/** A cell the person keeps, as the open dialog lists it. */
export interface OwnCell {
  id: string;
  name: string;
  latestVersion: number;
}

interface VersionMeta {
  version: number;
  authorName: string;
  message: string;
  createdAt: string;
}

const selectClass =
  'block w-full rounded-md border border-slate-300 bg-white px-3 py-2 text-sm text-slate-900 shadow-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30 aria-[invalid=true]:border-red-500';

/**
 * Open a changeover: one of my cells, the version that runs today (its latest by default), a
 * title and what changes and why. Lands on the new changeover's page.
 */
export function OpenChangeoverDialog({ open, onClose, cells }: { open: boolean; onClose: () => void; cells: OwnCell[] }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<OpenChangeoverInput>({
    resolver: zodResolver(openChangeoverSchema),
    defaultValues: { cellId: cells[0]?.id ?? '', title: '', description: '', baseVersion: cells[0]?.latestVersion },
  });
  const cellId = useWatch({ control: form.control, name: 'cellId' });
  const versions = useQuery({
    queryKey: ['cell-versions', cellId],
    queryFn: () => fetchJson<{ versions: VersionMeta[] }>(`/api/cells/${cellId}/versions`),
    enabled: open && Boolean(cellId),
  });
  const mutation = useMutation({
    mutationFn: (body: OpenChangeoverInput) => fetchJson<{ changeover: Changeover }>('/api/changeovers', { method: 'POST', body }),
    onSuccess: (data) => {
      void queryClient.invalidateQueries({ queryKey: ['changeovers'] });
      onClose();
      router.push(`/changeovers/${data.changeover.id}`);
    },
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['cellId', 'title', 'description', 'baseVersion'])),
  });
  const { errors } = form.formState;
  return (
    <Dialog title="Open a changeover" open={open} onClose={onClose} wide>
      {cells.length === 0 ? (
        <p className="text-sm text-slate-600">You keep no cells yet. Create or import the cell first; a changeover compares two of its versions.</p>
      ) : (
        <form
          noValidate
          className="space-y-4"
          onSubmit={form.handleSubmit((v) => {
            setFailure(null);
            mutation.mutate(v);
          })}
        >
          {failure ? <Notice tone="error">{failure}</Notice> : null}
          <div className="grid gap-4 sm:grid-cols-2">
            <div className="space-y-1">
              <label htmlFor="co-cell" className="block text-sm font-medium text-slate-700">
                Cell
              </label>
              <select
                id="co-cell"
                className={selectClass}
                aria-invalid={errors.cellId ? true : undefined}
                {...form.register('cellId', {
                  onChange: (e: { target: { value: string } }) => {
                    const c = cells.find((x) => x.id === e.target.value);
                    form.setValue('baseVersion', c?.latestVersion);
                  },
                })}
              >
                {cells.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.name}
                  </option>
                ))}
              </select>
              {errors.cellId ? <p className="text-xs text-red-700">{errors.cellId.message}</p> : null}
            </div>
            <div className="space-y-1">
              <label htmlFor="co-base" className="block text-sm font-medium text-slate-700">
                Base — the version that runs today
              </label>
              <select
                id="co-base"
                className={selectClass}
                aria-invalid={errors.baseVersion ? true : undefined}
                {...form.register('baseVersion', { setValueAs: (v: unknown) => (v === '' || v === undefined ? undefined : Number(v)) })}
              >
                {(versions.data?.versions ?? [{ version: form.getValues('baseVersion') ?? 1, authorName: '', message: '', createdAt: '' }]).map((v) => (
                  <option key={v.version} value={v.version}>
                    v{v.version}
                    {v.message ? ` — ${v.message.slice(0, 60)}` : ''}
                    {v.createdAt ? ` (${formatDateTime(v.createdAt)})` : ''}
                  </option>
                ))}
              </select>
              {errors.baseVersion ? (
                <p className="text-xs text-red-700">{errors.baseVersion.message}</p>
              ) : (
                <p className="text-xs text-slate-500">The proposal is edited in the workspace as new versions on top of the latest.</p>
              )}
            </div>
          </div>
          <TextField id="co-title" label="Title" placeholder="e.g. Rear guard door and DI card to slot 5" error={errors.title?.message} {...form.register('title')} />
          <TextAreaField
            id="co-description"
            label="What changes and why"
            rows={4}
            hint="The shift reads this on the signed record: what is added, moved or rewired, and the reason."
            error={errors.description?.message}
            {...form.register('description')}
          />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={onClose}>
              Cancel
            </Button>
            <Button type="submit" disabled={mutation.isPending}>
              Open changeover
            </Button>
          </div>
        </form>
      )}
    </Dialog>
  );
}
