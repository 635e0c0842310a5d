import { redirect } from 'next/navigation';
import type { ReactNode } from 'react';
import { AppSidebar } from '@/components/ui/app-sidebar';
import { RoleBadge } from '@/components/ui/role-badge';
import { SignOutButton } from '@/components/auth/sign-out-button';
import { getPageUser } from '@/lib/auth/session';
import { navFor } from '@/lib/roles';

export const dynamic = 'force-dynamic';

/**
 * The signed-in frame: navigation for the role (a sidebar that folds to a rail below 1024 px),
 * who is signed in, sign-out. The page column may shrink (`min-w-0`), so wide content scrolls
 * inside its own box instead of pushing the header and the page's actions off the screen.
 * Pages still check roles themselves.
 */
export default async function SignedInLayout({ children }: { children: ReactNode }) {
  const user = await getPageUser();
  if (!user) redirect('/sign-in');
  return (
    <div className="flex min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:fixed focus:left-2 focus:top-2 focus:z-50 focus:rounded-md focus:bg-white focus:px-3 focus:py-2 focus:text-sm focus:font-medium focus:text-accent-800 focus:shadow">
        Skip to the page
      </a>
      <AppSidebar items={navFor(user.role)} />
      <div className="flex min-w-0 flex-1 flex-col">
        <header className="flex flex-wrap items-center justify-end gap-x-3 gap-y-1 border-b border-slate-200 bg-white px-4 py-2 md:px-6" data-testid="user-menu">
          <span className="min-w-0 truncate text-sm text-slate-700" data-testid="signed-in-as">
            {user.name}
          </span>
          <RoleBadge role={user.role} />
          <SignOutButton />
        </header>
        <main id="main" tabIndex={-1} className="mx-auto w-full min-w-0 max-w-6xl px-4 py-6 focus:outline-none md:px-6 md:py-8">
          {children}
        </main>
      </div>
    </div>
  );
}
