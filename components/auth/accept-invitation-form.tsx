'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { fetchJson } from '@/lib/api/client';
import { personNameSchema, setPasswordFormSchema } from '@/lib/schemas/auth';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';

const formSchema = z.object({ name: personNameSchema }).and(setPasswordFormSchema);
type Values = z.infer<typeof formSchema>;

export function AcceptInvitationForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<Values>({ resolver: zodResolver(formSchema), defaultValues: { name: '', password: '', confirm: '' } });
  const mutation = useMutation({
    mutationFn: (v: Values) =>
      fetchJson<{ email: string }>('/api/invitations/accept', { method: 'POST', body: { token, name: v.name, password: v.password } }),
    onSuccess: () => router.push(`/sign-in?notice=account-created`),
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['name', 'password'])),
  });
  const { errors } = form.formState;
  return (
    <form
      noValidate
      aria-label="Create your account"
      className="space-y-4"
      onSubmit={form.handleSubmit((v) => {
        setFailure(null);
        mutation.mutate(v);
      })}
    >
      {failure ? <Notice tone="error">{failure}</Notice> : null}
      <TextField id="invite-email" label="E-mail" value={email} readOnly disabled />
      <TextField id="name" label="Your name" autoComplete="name" error={errors.name?.message} {...form.register('name')} />
      <TextField id="password" label="Password" type="password" autoComplete="new-password" hint="At least 10 characters." error={errors.password?.message} {...form.register('password')} />
      <TextField id="confirm" label="Repeat the password" type="password" autoComplete="new-password" error={errors.confirm?.message} {...form.register('confirm')} />
      <Button type="submit" className="w-full" disabled={mutation.isPending}>
        {mutation.isPending ? 'Creating account…' : 'Create account and join'}
      </Button>
    </form>
  );
}
