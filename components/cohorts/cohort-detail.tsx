'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { MailPlus, UserMinus, X } from 'lucide-react';
import { z } from 'zod';
import { fetchJson } from '@/lib/api/client';
import { MAX_INVITES_PER_REQUEST, splitAddresses } from '@/lib/schemas/cohorts';
import type { InviteResult } from '@/lib/schemas/cohorts';
import { Button } from '@/components/ui/button';
import { Card, PageHeader } from '@/components/ui/card';
import { TextAreaField } from '@/components/ui/field';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';
import type { CohortDetail as CohortDetailDto } from '@/lib/cohorts/types';
import { ListTable } from '@/components/ui/list-table';

const inviteFormSchema = z.object({
  addresses: z
    .string()
    .refine((t) => splitAddresses(t).length > 0, { message: 'Enter at least one address.' })
    .refine((t) => splitAddresses(t).length <= MAX_INVITES_PER_REQUEST, { message: `At most ${MAX_INVITES_PER_REQUEST} addresses at once.` }),
});
type InviteValues = z.infer<typeof inviteFormSchema>;

function InviteForm({ cohortId }: { cohortId: string }) {
  const queryClient = useQueryClient();
  const [results, setResults] = useState<InviteResult[] | null>(null);
  const form = useForm<InviteValues>({ resolver: zodResolver(inviteFormSchema), defaultValues: { addresses: '' } });
  const mutation = useMutation({
    mutationFn: (emails: string[]) =>
      fetchJson<{ results: InviteResult[] }>(`/api/cohorts/${cohortId}/invitations`, { method: 'POST', body: { emails } }),
    onSuccess: (data) => {
      setResults(data.results);
      if (data.results.every((r) => r.status === 'invited')) form.reset();
      void queryClient.invalidateQueries({ queryKey: ['cohort', cohortId] });
    },
  });
  return (
    <Card title="Invite students">
      <form noValidate aria-label="Invite students" className="space-y-3" onSubmit={form.handleSubmit((v) => mutation.mutate(splitAddresses(v.addresses)))}>
        <TextAreaField
          id="invite-addresses"
          label="E-mail addresses"
          rows={4}
          hint="One or many, separated by commas, spaces or new lines."
          error={form.formState.errors.addresses?.message}
          {...form.register('addresses')}
        />
        <Button type="submit" disabled={mutation.isPending}>
          <MailPlus aria-hidden className="h-4 w-4" />
          {mutation.isPending ? 'Sending…' : 'Send invitations'}
        </Button>
      </form>
      {mutation.error ? <Notice tone="error" className="mt-3">{mutation.error.message}</Notice> : null}
      {results ? (
        <ul aria-label="Invitation results" className="mt-3 space-y-1 text-sm">
          {results.map((r, i) => (
            <li key={`${r.email}-${i}`} data-testid="invite-result" className={r.status === 'invited' ? 'text-accent-800' : 'text-red-700'}>
              <span className="font-mono">{r.email}</span> — {r.status === 'invited' ? 'invitation sent' : r.reason}
            </li>
          ))}
        </ul>
      ) : null}
    </Card>
  );
}

export function CohortDetail({ cohortId }: { cohortId: string }) {
  const queryClient = useQueryClient();
  const query = useQuery({
    queryKey: ['cohort', cohortId],
    queryFn: () => fetchJson<{ cohort: CohortDetailDto }>(`/api/cohorts/${cohortId}`),
  });
  const refresh = () => void queryClient.invalidateQueries({ queryKey: ['cohort', cohortId] });
  const revoke = useMutation({
    mutationFn: (invitationId: string) => fetchJson(`/api/cohorts/${cohortId}/invitations/${invitationId}`, { method: 'DELETE' }),
    onSettled: refresh,
  });
  const remove = useMutation({
    mutationFn: (userId: string) => fetchJson(`/api/cohorts/${cohortId}/members/${userId}`, { method: 'DELETE' }),
    onSettled: refresh,
  });

  if (query.isPending) return <p className="text-sm text-slate-500">Loading…</p>;
  if (query.error) return <Notice tone="error">{query.error.message}</Notice>;
  const cohort = query.data.cohort;
  return (
    <>
      <PageHeader title={cohort.name} description={cohort.description || `Trainer: ${cohort.trainerName}`} />
      {revoke.error || remove.error ? <Notice tone="error" className="mb-4">{(revoke.error ?? remove.error)!.message}</Notice> : null}
      <div className="grid gap-6 lg:grid-cols-2">
        <Card title={`Members (${cohort.members.length})`}>
          {cohort.members.length === 0 ? (
            <p className="text-sm text-slate-500">No students yet.</p>
          ) : (
            <ul aria-label="Members" className="divide-y divide-slate-100 text-sm">
              {cohort.members.map((m) => (
                <li key={m.userId} className="flex items-center justify-between gap-2 py-2">
                  <span>
                    {m.name} <span className="font-mono text-xs text-slate-500">{m.email}</span>
                  </span>
                  <Button
                    variant="ghost"
                    aria-label={`Remove ${m.name} from the cohort`}
                    onClick={() => {
                      if (window.confirm(`Remove ${m.name} from ${cohort.name}? The account stays.`)) remove.mutate(m.userId);
                    }}
                  >
                    <UserMinus aria-hidden className="h-4 w-4" />
                  </Button>
                </li>
              ))}
            </ul>
          )}
        </Card>
        <InviteForm cohortId={cohortId} />
        <Card title={`Open invitations (${cohort.invitations.length})`} className="lg:col-span-2">
          <ListTable
            aria-label="Open invitations"
            empty={cohort.invitations.length === 0 && 'No open invitations.'}
            head={
              <>
                <th className="py-2">Address</th>
                <th>Invited by</th>
                <th>Sent</th>
                <th>Expires</th>
                <th />
              </>
            }
          >
            {cohort.invitations.map((inv) => (
              <tr key={inv.id}>
                <td className="py-2 font-mono">{inv.email}</td>
                <td>{inv.invitedByName}</td>
                <td className="font-mono text-xs">{formatDateTime(inv.createdAt)}</td>
                <td className="font-mono text-xs">{formatDateTime(inv.expiresAt)}</td>
                <td className="text-right">
                  <Button variant="danger" onClick={() => revoke.mutate(inv.id)} aria-label={`Revoke invitation for ${inv.email}`}>
                    <X aria-hidden className="h-4 w-4" />
                    Revoke
                  </Button>
                </td>
              </tr>
            ))}
          </ListTable>
        </Card>
      </div>
    </>
  );
}
