import { redirect } from 'next/navigation';
import type { ReactNode } from 'react';
import { getPageUser } from '@/lib/auth/session';

export const dynamic = 'force-dynamic';

/**
 * Printable pages (a changeover's signed record): signed in, but without the app's navigation
 * and header, so what prints is the document alone. Pages still check roles themselves.
 */
export default async function RecordLayout({ children }: { children: ReactNode }) {
  const user = await getPageUser();
  if (!user) redirect('/sign-in');
  return <main className="mx-auto max-w-4xl bg-white px-8 py-8 print:max-w-none print:px-0 print:py-0">{children}</main>;
}
