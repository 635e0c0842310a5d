import Link from 'next/link';
import { Lock } from 'lucide-react';
import { ROLE_LABELS } from '@/lib/roles';
import type { Role } from '@/lib/roles';

/** Shown in place of a page the signed-in role may not open. */
export function Refused({ role, needs }: { role: Role; needs: string }) {
  return (
    <div data-testid="access-refused" className="mx-auto max-w-lg rounded-lg border border-slate-200 bg-white p-8 text-center shadow-sm">
      <Lock aria-hidden className="mx-auto h-8 w-8 text-slate-500" />
      <h1 className="mt-3 text-xl font-semibold">Not available to your role</h1>
      <p className="mt-2 text-sm text-slate-600">
        You are signed in as {ROLE_LABELS[role].toLowerCase()}. This page is for {needs}.
      </p>
      <Link href="/dashboard" className="mt-4 inline-block text-sm font-medium text-accent-700 hover:underline">
        Back to your dashboard
      </Link>
    </div>
  );
}
