'use client';

import { useEffect } from 'react';
import { Button } from '@/components/ui/button';

/** Route-level error page: a short message and a retry, never the error's internals. */
export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <main className="flex min-h-[60vh] flex-col items-center justify-center gap-3 px-6 text-center">
      <h1 className="text-2xl font-semibold">Something went wrong</h1>
      <p className="max-w-md text-sm text-slate-600">
        The page could not be shown. Try again; if it keeps failing, tell your administrator
        {error.digest ? (
          <>
            {' '}
            and quote <span className="font-mono">{error.digest}</span>
          </>
        ) : null}
        .
      </p>
      <Button onClick={reset}>Try again</Button>
    </main>
  );
}
