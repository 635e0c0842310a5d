'use client';

import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { fetchJson } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

/** For a signed-in student whose address was invited: one click joins the cohort. */
export function JoinInvitation({ token, cohortName }: { token: string; cohortName: string }) {
  const router = useRouter();
  const mutation = useMutation({
    mutationFn: () => fetchJson('/api/invitations/join', { method: 'POST', body: { token } }),
    onSuccess: () => router.push('/dashboard'),
  });
  return (
    <div className="space-y-3">
      {mutation.error ? <Notice tone="error">{mutation.error.message}</Notice> : null}
      <Button onClick={() => mutation.mutate()} disabled={mutation.isPending} className="w-full">
        Join {cohortName}
      </Button>
    </div>
  );
}
