import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { SignInForm } from '@/components/auth/sign-in-form';
import { PublicShell } from '@/components/ui/public-shell';
import { getPageUser } from '@/lib/auth/session';
import { safeCallbackPath } from '@/lib/auth/callback-url';
import { env } from '@/lib/env';

export const metadata: Metadata = { title: 'Sign in · Cellwright' };

const NOTICES: Record<string, string> = {
  'account-created': 'Your account is ready. Sign in with your e-mail and new password.',
  'password-reset': 'Your password was changed. Sign in with the new one.',
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  // Only a path of this app survives (lib/auth/callback-url.ts); anything else becomes the dashboard.
  const callbackUrl = safeCallbackPath(typeof params.callbackUrl === 'string' ? params.callbackUrl : undefined, env().APP_URL);
  if (await getPageUser()) redirect('/dashboard');
  const notice = typeof params.notice === 'string' ? NOTICES[params.notice] : undefined;
  return (
    <PublicShell title="Sign in" intro="Use the e-mail address your trainer or administrator registered.">
      <SignInForm callbackUrl={callbackUrl} notice={notice} />
    </PublicShell>
  );
}
