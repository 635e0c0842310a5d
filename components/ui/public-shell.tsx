import Link from 'next/link';
import type { ReactNode } from 'react';
import { Logo } from './logo';

/** Frame for pages seen without a session: sign-in, invitations, resets. */
export function PublicShell({ children, title, intro }: { children: ReactNode; title: string; intro?: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-slate-200 bg-white">
        <div className="mx-auto flex max-w-5xl items-center justify-between px-6 py-3">
          <Link href="/" className="text-slate-900">
            <Logo />
          </Link>
        </div>
      </header>
      <main className="flex flex-1 items-start justify-center px-6 py-12">
        <div className="w-full max-w-md rounded-lg border border-slate-200 bg-white p-6 shadow-sm">
          <h1 className="text-xl font-semibold text-slate-900">{title}</h1>
          {intro ? <div className="mt-1 text-sm text-slate-600">{intro}</div> : null}
          <div className="mt-6">{children}</div>
        </div>
      </main>
    </div>
  );
}
