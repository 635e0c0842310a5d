'use client';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { Send } from 'lucide-react';
import { TextField } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ApiClientError, fetchJson } from '@/lib/api/client';

const schema = z
  .object({
    cohortId: z.string().min(1, { message: 'Choose a cohort.' }),
    opensAt: z.string().min(1, { message: 'Give the opening date and time.' }),
    closesAt: z.string().min(1, { message: 'Give the closing date and time.' }),
  })
  .refine((v) => new Date(v.closesAt).getTime() > new Date(v.opensAt).getTime(), { path: ['closesAt'], message: 'The drill must close after it opens.' });
type Values = z.infer<typeof schema>;

/** A `datetime-local` value for a Date, in the browser's zone. */
function localInput(d: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** Assign the drill to one of the trainer's cohorts; each student gets an e-mail. */
export function AssignForm({ drillId, cohorts }: { drillId: string; cohorts: { id: string; name: string; memberCount: number }[] }) {
  const router = useRouter();
  const now = new Date();
  const { register, handleSubmit, formState, reset } = useForm<Values>({
    resolver: zodResolver(schema),
    defaultValues: { cohortId: cohorts[0]?.id ?? '', opensAt: localInput(new Date(now.getTime() - 60_000)), closesAt: localInput(new Date(now.getTime() + 7 * 86_400_000)) },
  });
  const [result, setResult] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const onSubmit = handleSubmit(async (v) => {
    setResult(null);
    try {
      const a = await fetchJson<{ mailed: number; students: number }>(`/api/drills/${drillId}/assignments`, {
        method: 'POST',
        body: { cohortId: v.cohortId, opensAt: new Date(v.opensAt).toISOString(), closesAt: new Date(v.closesAt).toISOString() },
      });
      setResult({ tone: 'success', text: `Assigned. ${a.mailed} of ${a.students} students were e-mailed.` });
      reset(v);
      router.refresh();
    } catch (e) {
      setResult({ tone: 'error', text: e instanceof ApiClientError ? [e.message, ...Object.values(e.fields ?? {}).flat()].join(' ') : 'The drill could not be assigned.' });
    }
  });
  if (cohorts.length === 0) return <p className="text-sm text-slate-500">You have no cohorts yet. Create one under Cohorts first.</p>;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Assign drill">
      <div className="grid gap-3 sm:grid-cols-3">
        <div className="space-y-1">
          <label htmlFor="assign-cohort" className="block text-sm font-medium text-slate-700">
            Cohort
          </label>
          <select id="assign-cohort" className="block w-full rounded-md border border-slate-300 bg-white px-3 py-2 text-sm text-slate-900 shadow-sm" {...register('cohortId')}>
            {cohorts.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name} ({c.memberCount})
              </option>
            ))}
          </select>
        </div>
        <TextField id="assign-opens" label="Opens" type="datetime-local" error={formState.errors.opensAt?.message} {...register('opensAt')} />
        <TextField id="assign-closes" label="Closes" type="datetime-local" error={formState.errors.closesAt?.message} {...register('closesAt')} />
      </div>
      {result ? <Notice tone={result.tone}>{result.text}</Notice> : null}
      <Button type="submit" disabled={formState.isSubmitting} data-testid="assign-drill">
        <Send aria-hidden className="h-4 w-4" /> Assign and e-mail
      </Button>
    </form>
  );
}
