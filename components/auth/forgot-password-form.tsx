'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { fetchJson } from '@/lib/api/client';
import { requestResetSchema } from '@/lib/schemas/auth';
import type { RequestResetInput } from '@/lib/schemas/auth';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';

export function ForgotPasswordForm() {
  const [done, setDone] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<RequestResetInput>({ resolver: zodResolver(requestResetSchema), defaultValues: { email: '' } });
  const mutation = useMutation({
    mutationFn: (body: RequestResetInput) => fetchJson<{ message: string }>('/api/password-resets', { method: 'POST', body }),
    onSuccess: (data) => setDone(data.message),
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['email'])),
  });

  if (done) return <Notice tone="success">{done}</Notice>;
  return (
    <form
      noValidate
      aria-label="Request a password reset"
      className="space-y-4"
      onSubmit={form.handleSubmit((v) => {
        setFailure(null);
        mutation.mutate(v);
      })}
    >
      {failure ? <Notice tone="error">{failure}</Notice> : null}
      <TextField id="email" label="E-mail" type="email" autoComplete="email" error={form.formState.errors.email?.message} {...form.register('email')} />
      <Button type="submit" className="w-full" disabled={mutation.isPending}>
        {mutation.isPending ? 'Sending…' : 'Send reset link'}
      </Button>
    </form>
  );
}
