'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { fetchJson } from '@/lib/api/client';
import { CELL_TEMPLATES, TEMPLATE_LABELS } from '@/lib/cells/template-names';
import { createCellSchema, renameCellSchema } from '@/lib/schemas/cells';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';
import { Dialog } from './dialog';
import type { CellSummaryDto } from './types';

type CreateValues = z.input<typeof createCellSchema>;

/** New cell: a name and a starting point; opens the workspace on success. */
export function CreateCellDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<CreateValues>({ resolver: zodResolver(createCellSchema), defaultValues: { name: '', template: 'pick-and-place' } });
  const mutation = useMutation({
    mutationFn: (body: CreateValues) => fetchJson<{ cell: CellSummaryDto }>('/api/cells', { method: 'POST', body }),
    onSuccess: (data) => {
      void queryClient.invalidateQueries({ queryKey: ['cells'] });
      form.reset();
      onClose();
      router.push(`/cells/${data.cell.id}`);
    },
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['name', 'template'])),
  });
  const { errors } = form.formState;
  return (
    <Dialog title="New cell" open={open} onClose={onClose}>
      <form
        noValidate
        className="space-y-4"
        onSubmit={form.handleSubmit((v) => {
          setFailure(null);
          mutation.mutate(v);
        })}
      >
        {failure ? <Notice tone="error">{failure}</Notice> : null}
        <TextField id="new-cell-name" label="Name" autoFocus error={errors.name?.message} {...form.register('name')} />
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium text-slate-700">Start from</legend>
          {CELL_TEMPLATES.map((t) => (
            <label key={t} className="flex cursor-pointer gap-3 rounded-md border border-slate-200 p-3 has-[:checked]:border-accent-600 has-[:checked]:bg-accent-50">
              <input type="radio" value={t} className="mt-1 accent-accent-700" {...form.register('template')} />
              <span>
                <span className="block text-sm font-medium">{TEMPLATE_LABELS[t].label}</span>
                <span className="block text-xs text-slate-600">{TEMPLATE_LABELS[t].description}</span>
              </span>
            </label>
          ))}
          {errors.template ? <p className="text-xs text-red-700">{errors.template.message}</p> : null}
        </fieldset>
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" disabled={mutation.isPending}>
            Create cell
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

type RenameValues = z.input<typeof renameCellSchema>;

export function RenameCellDialog({ cell, onClose }: { cell: CellSummaryDto | null; onClose: () => void }) {
  const queryClient = useQueryClient();
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<RenameValues>({ resolver: zodResolver(renameCellSchema), values: { name: cell?.name ?? '' } });
  const mutation = useMutation({
    mutationFn: (body: RenameValues) => fetchJson(`/api/cells/${cell!.id}`, { method: 'PATCH', body }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: ['cells'] });
      onClose();
    },
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['name'])),
  });
  return (
    <Dialog title="Rename cell" open={cell !== null} onClose={onClose}>
      <form
        noValidate
        className="space-y-4"
        onSubmit={form.handleSubmit((v) => {
          setFailure(null);
          mutation.mutate(v);
        })}
      >
        {failure ? <Notice tone="error">{failure}</Notice> : null}
        <TextField id="rename-cell-name" label="Name" autoFocus error={form.formState.errors.name?.message} {...form.register('name')} />
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" disabled={mutation.isPending}>
            Rename
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

/** Delete needs the user to confirm; students' copies of a shared cell are not affected. */
export function DeleteCellDialog({ cell, onClose }: { cell: CellSummaryDto | null; onClose: () => void }) {
  const queryClient = useQueryClient();
  const mutation = useMutation({
    mutationFn: () => fetchJson(`/api/cells/${cell!.id}`, { method: 'DELETE' }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: ['cells'] });
      onClose();
    },
  });
  return (
    <Dialog title="Delete cell" open={cell !== null} onClose={onClose}>
      <div className="space-y-4 text-sm">
        {mutation.error ? <Notice tone="error">{mutation.error.message}</Notice> : null}
        <p>
          Delete <strong>{cell?.name}</strong> and its {cell?.versionCount} version{cell?.versionCount === 1 ? '' : 's'}? It disappears from your list
          {cell && cell.sharedWith.length > 0 ? ' and from the cohorts it is shared with (students keep their own copies)' : ''}.
        </p>
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Keep it
          </Button>
          <Button variant="danger" disabled={mutation.isPending} onClick={() => mutation.mutate()}>
            Delete cell
          </Button>
        </div>
      </div>
    </Dialog>
  );
}
