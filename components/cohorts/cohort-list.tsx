'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Plus } from 'lucide-react';
import type { z } from 'zod';
import { fetchJson } from '@/lib/api/client';
import { createCohortSchema } from '@/lib/schemas/cohorts';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextAreaField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';
import type { CohortSummary } from '@/lib/cohorts/types';

type FormValues = z.input<typeof createCohortSchema>;

function CreateCohortForm() {
  const queryClient = useQueryClient();
  const [failure, setFailure] = useState<string | null>(null);
  const [created, setCreated] = useState<string | null>(null);
  const form = useForm<FormValues>({ resolver: zodResolver(createCohortSchema), defaultValues: { name: '', description: '' } });
  const mutation = useMutation({
    mutationFn: (body: FormValues) => fetchJson<{ cohort: CohortSummary }>('/api/cohorts', { method: 'POST', body }),
    onSuccess: (data) => {
      setCreated(data.cohort.name);
      form.reset();
      void queryClient.invalidateQueries({ queryKey: ['cohorts'] });
    },
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['name', 'description'])),
  });
  const { errors } = form.formState;
  return (
    <Card title="New cohort">
      <form
        noValidate
        aria-label="New cohort"
        className="space-y-4"
        onSubmit={form.handleSubmit((v) => {
          setFailure(null);
          setCreated(null);
          mutation.mutate(v);
        })}
      >
        {failure ? <Notice tone="error">{failure}</Notice> : null}
        {created ? <Notice tone="success">Cohort “{created}” created.</Notice> : null}
        <TextField id="cohort-name" label="Name" error={errors.name?.message} {...form.register('name')} />
        <TextAreaField id="cohort-description" label="Description" rows={3} error={errors.description?.message} {...form.register('description')} />
        <Button type="submit" disabled={mutation.isPending}>
          <Plus aria-hidden className="h-4 w-4" />
          Create cohort
        </Button>
      </form>
    </Card>
  );
}

export function CohortList({ showTrainer }: { showTrainer: boolean }) {
  const query = useQuery({ queryKey: ['cohorts'], queryFn: () => fetchJson<{ cohorts: CohortSummary[] }>('/api/cohorts') });
  return (
    <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
      <Card title="Cohorts">
        {query.isPending ? <p className="text-sm text-slate-500">Loading…</p> : null}
        {query.error ? <Notice tone="error">{query.error.message}</Notice> : null}
        {query.data && query.data.cohorts.length === 0 ? <p className="text-sm text-slate-500">No cohorts yet.</p> : null}
        {query.data && query.data.cohorts.length > 0 ? (
          <ul className="divide-y divide-slate-100">
            {query.data.cohorts.map((c) => (
              <li key={c.id} className="flex flex-wrap items-center justify-between gap-2 py-3">
                <div>
                  <Link href={`/cohorts/${c.id}`} className="font-medium text-accent-700 hover:underline">
                    {c.name}
                  </Link>
                  {c.description ? <p className="text-sm text-slate-600">{c.description}</p> : null}
                  {showTrainer ? <p className="text-xs text-slate-500">Trainer: {c.trainerName}</p> : null}
                </div>
                <p className="text-sm text-slate-600">
                  <span className="font-mono">{c.memberCount}</span> members · <span className="font-mono">{c.pendingCount}</span> invited
                </p>
              </li>
            ))}
          </ul>
        ) : null}
      </Card>
      <CreateCohortForm />
    </div>
  );
}
