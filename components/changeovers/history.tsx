import type { ChangeoverEvent } from '@/lib/changeovers/types';
import { formatDateTime } from '@/lib/format';

const num = (v: unknown) => (typeof v === 'number' ? `v${v}` : '?');

/** One event of a changeover's history in words. */
export function eventWords(e: ChangeoverEvent): string {
  const d = e.detail;
  switch (e.kind) {
    case 'opened':
      return `opened the changeover on base ${num(d.baseVersion)}`;
    case 'edited':
      return 'edited the title or description';
    case 'countersigner': {
      const who = d.countersigner as { name?: string } | null | undefined;
      return who?.name ? `asked ${who.name} to countersign` : 'cleared the countersigner';
    }
    case 'pinned':
      return `pinned the proposal at ${num(d.proposedVersion)}`;
    case 'unpinned':
      return `went back to drafting (${num(d.proposedVersion)} unpinned${d.hadSignature ? ', signature dropped' : ''})`;
    case 'signed':
      return `signed ${num(d.baseVersion)} → ${num(d.proposedVersion)}`;
    case 'signature-withdrawn':
      return 'withdrew the signature';
    case 'countersigned':
      return 'countersigned; the record was written';
    case 'rolled-back':
      return d.version === d.baseVersion ? 'rolled back' : `rolled back: ${num(d.version)} restores base ${num(d.baseVersion)}`;
    case 'withdrawn':
      return d.version === d.baseVersion ? 'abandoned the proposal' : `abandoned the proposal: ${num(d.version)} restores base ${num(d.baseVersion)}`;
  }
}

export function ChangeoverHistory({ events }: { events: ChangeoverEvent[] }) {
  return (
    <ol className="space-y-1 text-sm" data-testid="changeover-history">
      {events.map((e) => (
        <li key={e.id} className="flex flex-wrap gap-x-3">
          <span className="w-40 shrink-0 font-mono text-xs leading-5 text-slate-500">{formatDateTime(e.createdAt)}</span>
          <span>
            <span className="font-medium text-slate-900">{e.actor.name}</span> {eventWords(e)}
          </span>
        </li>
      ))}
    </ol>
  );
}
