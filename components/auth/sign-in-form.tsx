'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import Link from 'next/link';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { LogIn } from 'lucide-react';
import { signInSchema } from '@/lib/schemas/auth';
import type { SignInInput } from '@/lib/schemas/auth';
import { NEXTAUTH_CREDENTIALS_ERROR, SIGN_IN_MESSAGES } from '@/lib/auth/messages';
import { safeCallbackPath } from '@/lib/auth/callback-url';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';

export function SignInForm({ callbackUrl, notice }: { callbackUrl?: string; notice?: string }) {
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<SignInInput>({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setError(null);
    const result = await signIn('credentials', { ...values, redirect: false });
    if (!result || result.error) {
      const code = result?.error;
      setError(!code || code === NEXTAUTH_CREDENTIALS_ERROR ? SIGN_IN_MESSAGES.invalid : code);
      return;
    }
    // A full navigation so every server component sees the new session cookie; only ever to a
    // path of this app (the page checked it too: this is the last word before the browser goes).
    window.location.assign(safeCallbackPath(callbackUrl, window.location.origin));
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Sign in">
      {notice ? <Notice tone="success">{notice}</Notice> : null}
      {error ? <Notice tone="error">{error}</Notice> : null}
      <TextField id="email" label="E-mail" type="email" autoComplete="email" error={errors.email?.message} {...register('email')} />
      <TextField
        id="password"
        label="Password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...register('password')}
      />
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        <LogIn aria-hidden className="h-4 w-4" />
        {isSubmitting ? 'Signing in…' : 'Sign in'}
      </Button>
      <p className="text-center text-sm">
        <Link href="/forgot-password" className="text-accent-700 hover:underline">
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}
