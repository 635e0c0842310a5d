import Link from 'next/link';
import type { Changeover } from '@/lib/changeovers/types';
import { Card } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';
import { StateBadge } from './state-badge';

/** A lead's or trainer's changeovers on their dashboard: the open ones first, then the latest closed. */
export function ChangeoversCard({ changeovers }: { changeovers: Changeover[] }) {
  const open = changeovers.filter((c) => c.state === 'drafting' || c.state === 'checked');
  const shown = [...open, ...changeovers.filter((c) => !open.includes(c))].slice(0, 5);
  return (
    <Card
      title="Changeovers"
      actions={
        <Link href="/changeovers" className="text-sm font-medium text-accent-700 hover:underline">
          All changeovers
        </Link>
      }
    >
      {shown.length === 0 ? (
        <p className="text-sm text-slate-500">No changeovers yet. Open one from the Changeovers page on a cell you keep.</p>
      ) : (
        <ul className="divide-y divide-slate-100 text-sm" data-testid="dashboard-changeovers">
          {shown.map((c) => (
            <li key={c.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
              <span>
                <Link href={`/changeovers/${c.id}`} className="font-medium text-accent-700 hover:underline">
                  {c.title}
                </Link>
                <span className="block text-xs text-slate-500">
                  {c.cellName} · last change {formatDateTime(c.updatedAt)}
                </span>
              </span>
              <StateBadge changeover={c} />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
