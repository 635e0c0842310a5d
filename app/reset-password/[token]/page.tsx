import type { Metadata } from 'next';
import { LinkProblem } from '@/components/auth/link-problem';
import { ResetPasswordForm } from '@/components/auth/reset-password-form';
import { PublicShell } from '@/components/ui/public-shell';
import { tokenSchema } from '@/lib/schemas/auth';
import { lookupPasswordReset } from '@/db/password-resets';

export const metadata: Metadata = { title: 'Choose a new password · Cellwright' };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const state = tokenSchema.safeParse(token).success ? await lookupPasswordReset(token) : 'invalid';
  return (
    <PublicShell title="Choose a new password">
      {state === 'valid' ? (
        <ResetPasswordForm token={token} />
      ) : (
        <LinkProblem state={state} next={{ href: '/forgot-password', label: 'Ask for a new reset link' }} />
      )}
    </PublicShell>
  );
}
