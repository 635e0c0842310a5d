'use client';
/**
 * Accepting a violation or a changed outcome with a written reason, and showing who accepted
 * it and when. The reason goes into the signed record, so it is asked for in words.
 */
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Button } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format';
import { fetchJson } from '@/lib/api/client';
import { acceptanceSchema } from '@/lib/schemas/evidence';
import type { AcceptanceInfo } from '@/lib/changeovers/evidence';
import { useEvidenceMutation } from './use-evidence';

type Props = {
  changeoverId: string;
  /** `verdicts/<id>` or `checks/<id>` under the changeover. */
  target: string;
  /** What is being accepted, for the labels ("the violation of “No start with a guard open”"). */
  what: string;
  acceptance: AcceptanceInfo | null;
  canEdit: boolean;
};

export function AcceptanceBox({ changeoverId, target, what, acceptance, canEdit }: Props) {
  const [open, setOpen] = useState(false);
  const form = useForm<{ reason: string }>({ resolver: zodResolver(acceptanceSchema), defaultValues: { reason: '' } });
  const url = `/api/changeovers/${changeoverId}/${target}/acceptance`;
  const accept = useEvidenceMutation(changeoverId, (reason: string) => fetchJson(url, { method: 'PUT', body: { reason } }));
  const withdraw = useEvidenceMutation(changeoverId, () => fetchJson(url, { method: 'DELETE' }));
  const error = accept.error ?? withdraw.error;

  if (acceptance) {
    return (
      <div className="rounded-md border border-slate-300 bg-slate-50 px-3 py-2 text-sm" data-testid="acceptance">
        <p>
          <span className="font-semibold">Accepted</span> by {acceptance.by.name} on {formatDateTime(acceptance.at)}:
        </p>
        <p className="whitespace-pre-line text-slate-700">“{acceptance.reason}”</p>
        {canEdit ? (
          <Button variant="ghost" className="mt-1 px-2 py-1 text-xs" onClick={() => withdraw.mutate(undefined)} disabled={withdraw.isPending}>
            Take the acceptance back
          </Button>
        ) : null}
        {error ? <p role="alert" className="text-xs text-red-700">{error.message}</p> : null}
      </div>
    );
  }
  if (!canEdit) return <p className="text-xs text-amber-900">Not accepted yet: the person who opened the changeover accepts it with a reason, or fixes it.</p>;
  if (!open) {
    return (
      <Button variant="secondary" className="px-2 py-1 text-xs" onClick={() => setOpen(true)}>
        Accept with a reason…
      </Button>
    );
  }
  return (
    <form
      className="space-y-2"
      onSubmit={form.handleSubmit(async ({ reason }) => {
        await accept.mutateAsync(reason).then(() => setOpen(false)).catch(() => undefined);
      })}
      noValidate
    >
      <label className="block text-xs font-medium text-slate-600">
        Why is {what} acceptable?
        <textarea
          rows={3}
          className="mt-1 block w-full rounded-md border border-slate-300 px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30"
          aria-invalid={Boolean(form.formState.errors.reason)}
          {...form.register('reason')}
        />
      </label>
      {form.formState.errors.reason ? <p role="alert" className="text-xs text-red-700">{form.formState.errors.reason.message}</p> : null}
      {error ? <p role="alert" className="text-xs text-red-700">{error.message}</p> : null}
      <div className="flex gap-2">
        <Button type="submit" className="px-2 py-1 text-xs" disabled={accept.isPending}>
          Accept
        </Button>
        <Button variant="ghost" className="px-2 py-1 text-xs" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
