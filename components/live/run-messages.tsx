'use client';
import { useState } from 'react';
import { MessageSquare } from 'lucide-react';
import type { StudentMessage } from '@/lib/live/types';
import { useLiveStream } from './use-live-stream';

/**
 * Hints and messages from the trainer during a drill attempt: the student's own message stream
 * (GET /api/assignments/[id]/messages/stream), newest first; a new one is announced politely.
 */
export function RunMessages({ assignmentId }: { assignmentId: string }) {
  const [messages, setMessages] = useState<StudentMessage[]>([]);
  useLiveStream(`/api/assignments/${assignmentId}/messages/stream`, {
    messages: (d) => setMessages(d as StudentMessage[]),
    message: (d) => {
      const m = d as StudentMessage;
      setMessages((ms) => (ms.some((x) => x.id === m.id) ? ms : [...ms, m]));
    },
  });
  if (messages.length === 0) return <div aria-live="polite" className="sr-only" />;
  return (
    <section aria-label="From your trainer" className="rounded-md border border-accent-200 bg-accent-50 px-4 py-2 text-sm" data-testid="run-messages">
      <h2 className="flex items-center gap-1 text-xs font-semibold uppercase tracking-wide text-accent-800">
        <MessageSquare aria-hidden className="h-3.5 w-3.5" /> From your trainer
      </h2>
      <ol aria-live="polite" className="mt-1 space-y-1">
        {[...messages].reverse().map((m) => (
          <li key={m.id}>
            <span className="text-xs text-slate-500">
              {new Date(m.createdAt).toLocaleTimeString()} · {m.kind === 'hint' ? 'Hint' : 'Message'} from {m.authorName}:
            </span>{' '}
            {m.body}
          </li>
        ))}
      </ol>
    </section>
  );
}
