import Link from 'next/link';
import { redirect } from 'next/navigation';
import type { ReactNode } from 'react';
import { AppNav } from '@/components/ui/app-nav';
import { Logo } from '@/components/ui/logo';
import { RoleBadge } from '@/components/ui/role-badge';
import { SignOutButton } from '@/components/auth/sign-out-button';
import { getPageUser } from '@/lib/auth/session';
import { navFor } from '@/lib/roles';

export const dynamic = 'force-dynamic';

/** The signed-in frame: navigation for the role, who is signed in, sign-out. Pages still check roles themselves. */
export default async function SignedInLayout({ children }: { children: ReactNode }) {
  const user = await getPageUser();
  if (!user) redirect('/sign-in');
  return (
    <div className="min-h-screen md:flex">
      <aside className="border-b border-slate-200 bg-white md:min-h-screen md:w-60 md:border-b-0 md:border-r">
        <div className="flex items-center justify-between gap-2 px-4 py-3 md:block md:space-y-6 md:py-5">
          <Link href="/dashboard" className="text-slate-900">
            <Logo />
          </Link>
          <AppNav items={navFor(user.role)} />
        </div>
      </aside>
      <div className="flex-1">
        <header className="flex items-center justify-end gap-3 border-b border-slate-200 bg-white px-6 py-2">
          <span className="text-sm text-slate-700" data-testid="signed-in-as">
            {user.name}
          </span>
          <RoleBadge role={user.role} />
          <SignOutButton />
        </header>
        <main className="mx-auto max-w-6xl px-6 py-8">{children}</main>
      </div>
    </div>
  );
}
