'use client';

import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { RefreshCw } from 'lucide-react';
import { fetchJson } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';

interface MailSummary {
  id: string;
  fromHeader: string;
  toHeader: string;
  subject: string;
  receivedAt: string;
}

interface MailMessage extends MailSummary {
  envelopeFrom: string;
  envelopeTo: string[];
  textBody: string;
  htmlBody: string | null;
  sizeBytes: number;
}

/** Plain-text body with its web addresses made clickable (the catcher's mails carry invitation and reset links). */
function LinkedText({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <pre className="whitespace-pre-wrap break-words font-mono text-sm text-slate-800" data-testid="mail-text">
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="text-accent-700 underline">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </pre>
  );
}

function MessageView({ id }: { id: string }) {
  const [view, setView] = useState<'text' | 'html'>('text');
  const query = useQuery({ queryKey: ['mail', id], queryFn: () => fetchJson<{ message: MailMessage }>(`/api/admin/mail/${id}`) });
  if (query.isPending) return <p className="text-sm text-slate-500">Loading…</p>;
  if (query.error) return <Notice tone="error">{query.error.message}</Notice>;
  const m = query.data.message;
  return (
    <article aria-label="Message" className="space-y-3">
      <h2 className="text-lg font-semibold">{m.subject || '(no subject)'}</h2>
      <dl className="grid grid-cols-[5rem_1fr] gap-y-1 text-sm">
        <dt className="text-slate-500">From</dt>
        <dd className="font-mono text-xs leading-5">{m.fromHeader}</dd>
        <dt className="text-slate-500">To</dt>
        <dd className="font-mono text-xs leading-5">{m.toHeader || m.envelopeTo.join(', ')}</dd>
        <dt className="text-slate-500">Received</dt>
        <dd className="font-mono text-xs leading-5">{formatDateTime(m.receivedAt)}</dd>
      </dl>
      {m.htmlBody ? (
        <div role="tablist" aria-label="Body format" className="flex gap-2">
          {(['text', 'html'] as const).map((v) => (
            <button
              key={v}
              role="tab"
              aria-selected={view === v}
              onClick={() => setView(v)}
              className={cn('rounded-md px-2 py-1 text-xs font-medium', view === v ? 'bg-accent-50 text-accent-800 ring-1 ring-accent-200' : 'text-slate-600 hover:bg-slate-100')}
            >
              {v === 'text' ? 'Text' : 'HTML'}
            </button>
          ))}
        </div>
      ) : null}
      <div className="rounded-md border border-slate-200 bg-slate-50 p-3">
        {view === 'html' && m.htmlBody ? (
          // sandbox="" : no scripts, no same-origin access, no navigation from the message.
          <iframe title="HTML body" sandbox="" srcDoc={m.htmlBody} className="h-80 w-full bg-white" />
        ) : (
          <LinkedText text={m.textBody} />
        )}
      </div>
    </article>
  );
}

export function Mailbox() {
  const [selected, setSelected] = useState<string | null>(null);
  const list = useQuery({ queryKey: ['mail'], queryFn: () => fetchJson<{ messages: MailSummary[] }>('/api/admin/mail') });
  return (
    <div className="grid gap-6 lg:grid-cols-[22rem_1fr]">
      <section aria-label="Messages" className="rounded-lg border border-slate-200 bg-white shadow-sm">
        <div className="flex items-center justify-between border-b border-slate-200 px-3 py-2">
          <span className="text-sm font-medium">{list.data ? `${list.data.messages.length} message${list.data.messages.length === 1 ? '' : 's'}` : 'Messages'}</span>
          <Button variant="ghost" onClick={() => void list.refetch()} aria-label="Refresh messages">
            <RefreshCw aria-hidden className={cn('h-4 w-4', list.isFetching && 'animate-spin')} />
          </Button>
        </div>
        {list.error ? <Notice tone="error" className="m-3">{list.error.message}</Notice> : null}
        {list.data && list.data.messages.length === 0 ? <p className="p-3 text-sm text-slate-500">No mail captured yet.</p> : null}
        <ul className="max-h-[70vh] divide-y divide-slate-100 overflow-y-auto">
          {list.data?.messages.map((m) => (
            <li key={m.id}>
              <button
                type="button"
                onClick={() => setSelected(m.id)}
                aria-current={selected === m.id ? 'true' : undefined}
                className={cn('block w-full px-3 py-2 text-left', selected === m.id ? 'bg-accent-50' : 'hover:bg-slate-50')}
              >
                <span className="block truncate text-sm font-medium">{m.subject || '(no subject)'}</span>
                <span className="block truncate font-mono text-xs text-slate-500">to {m.toHeader}</span>
                <span className="block font-mono text-xs text-slate-600">{formatDateTime(m.receivedAt)}</span>
              </button>
            </li>
          ))}
        </ul>
      </section>
      <section className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
        {selected ? <MessageView id={selected} /> : <p className="text-sm text-slate-500">Choose a message to read it.</p>}
      </section>
    </div>
  );
}
