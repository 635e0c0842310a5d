import Link from 'next/link';
import { Logo } from '@/components/ui/logo';

export default function NotFound() {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center gap-3 px-6 text-center">
      <Logo className="text-slate-900" />
      <p className="font-mono text-sm text-slate-500">404</p>
      <h1 className="text-2xl font-semibold">Nothing at this address</h1>
      <p className="max-w-md text-sm text-slate-600">The page was moved, never existed, or the link is incomplete.</p>
      <Link href="/" className="text-sm font-medium text-accent-700 hover:underline">
        Back to the start page
      </Link>
    </main>
  );
}
