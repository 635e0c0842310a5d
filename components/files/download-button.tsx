'use client';
import { useRef, useState } from 'react';
import { Download, Loader2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

/** How often a download that is still being made (503 with Retry-After) is asked for again before giving up. */
const MAX_WAITS = 12;

type State = { kind: 'idle' } | { kind: 'working'; note: string } | { kind: 'error'; message: string };

function fileNameOf(res: Response, fallback: string): string {
  const m = /filename="([^"]+)"/.exec(res.headers.get('content-disposition') ?? '');
  return m?.[1] ?? fallback;
}

/** Hands a fetched file to the browser's own download (the file came through the app's checks; nothing links into the bucket). */
async function save(res: Response, fallback: string): Promise<void> {
  const url = URL.createObjectURL(await res.blob());
  const a = document.createElement('a');
  a.href = url;
  a.download = fileNameOf(res, fallback);
  document.body.append(a);
  a.click();
  a.remove();
  // The click has started the download; the object URL is not needed after this turn.
  setTimeout(() => URL.revokeObjectURL(url), 0);
}

/**
 * A button that downloads a file from one of the app's download routes. `prepare` (optional)
 * makes the file first and answers its URL (a run archive is exported, then fetched). A route
 * that answers 503 with Retry-After (the printed report while its job runs) is asked again
 * after the time it names, saying so; any other failure shows the route's message.
 */
export function DownloadButton({
  label,
  url,
  prepare,
  fallbackName,
  waitingNote,
  testId,
}: {
  label: string;
  url?: string;
  prepare?: () => Promise<string>;
  fallbackName: string;
  waitingNote: string;
  testId: string;
}) {
  const [state, setState] = useState<State>({ kind: 'idle' });
  const busy = useRef(false);

  async function run() {
    if (busy.current) return;
    busy.current = true;
    try {
      setState({ kind: 'working', note: 'Preparing the file…' });
      const target = prepare ? await prepare() : url!;
      for (let wait = 0; ; wait++) {
        const res = await fetch(target, { credentials: 'same-origin', cache: 'no-store' });
        if (res.ok) {
          await save(res, fallbackName);
          setState({ kind: 'idle' });
          return;
        }
        const retryAfter = Number(res.headers.get('retry-after'));
        if (res.status === 503 && retryAfter > 0 && wait < MAX_WAITS) {
          setState({ kind: 'working', note: waitingNote });
          await new Promise((r) => setTimeout(r, Math.min(retryAfter, 30) * 1000));
          continue;
        }
        const body = (await res.json().catch(() => null)) as { error?: string } | null;
        throw new Error(body?.error ?? `The download failed (${res.status}).`);
      }
    } catch (err) {
      setState({ kind: 'error', message: err instanceof Error ? err.message : String(err) });
    } finally {
      busy.current = false;
    }
  }

  const working = state.kind === 'working';
  return (
    <div className="flex flex-col items-start gap-2">
      <Button variant="secondary" onClick={run} disabled={working} aria-busy={working} data-testid={testId}>
        {working ? <Loader2 aria-hidden className="h-4 w-4 animate-spin" /> : <Download aria-hidden className="h-4 w-4" />}
        {label}
      </Button>
      {working ? (
        <p role="status" className="text-sm text-slate-600" data-testid={`${testId}-status`}>
          {state.note}
        </p>
      ) : null}
      {state.kind === 'error' ? <Notice tone="error">{state.message}</Notice> : null}
    </div>
  );
}
