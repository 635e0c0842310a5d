import type { Metadata } from 'next';
import Link from 'next/link';
import { ForgotPasswordForm } from '@/components/auth/forgot-password-form';
import { PublicShell } from '@/components/ui/public-shell';

export const metadata: Metadata = { title: 'Reset password · Cellwright' };

export default function ForgotPasswordPage() {
  return (
    <PublicShell title="Reset your password" intro="We send a link that lets you choose a new password. It works once, for one hour.">
      <ForgotPasswordForm />
      <p className="mt-4 text-center text-sm">
        <Link href="/sign-in" className="text-accent-700 hover:underline">
          Back to sign-in
        </Link>
      </p>
    </PublicShell>
  );
}
