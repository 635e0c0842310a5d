'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { fetchJson } from '@/lib/api/client';
import { setPasswordFormSchema } from '@/lib/schemas/auth';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';

type Values = z.infer<typeof setPasswordFormSchema>;

export function ResetPasswordForm({ token }: { token: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<Values>({ resolver: zodResolver(setPasswordFormSchema), defaultValues: { password: '', confirm: '' } });
  const mutation = useMutation({
    mutationFn: (v: Values) => fetchJson('/api/password-resets/complete', { method: 'POST', body: { token, password: v.password } }),
    onSuccess: () => router.push('/sign-in?notice=password-reset'),
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['password'])),
  });
  const { errors } = form.formState;
  return (
    <form
      noValidate
      aria-label="Choose a new password"
      className="space-y-4"
      onSubmit={form.handleSubmit((v) => {
        setFailure(null);
        mutation.mutate(v);
      })}
    >
      {failure ? <Notice tone="error">{failure}</Notice> : null}
      <TextField id="password" label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." error={errors.password?.message} {...form.register('password')} />
      <TextField id="confirm" label="Repeat the password" type="password" autoComplete="new-password" error={errors.confirm?.message} {...form.register('confirm')} />
      <Button type="submit" className="w-full" disabled={mutation.isPending}>
        {mutation.isPending ? 'Saving…' : 'Set new password'}
      </Button>
    </form>
  );
}
