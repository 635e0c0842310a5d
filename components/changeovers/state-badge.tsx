import { Ban, BadgeCheck, Hourglass, ListChecks, PencilLine, Undo2 } from 'lucide-react';
import type { Changeover, ChangeoverState } from '@/lib/changeovers/types';
import { cn } from '@/components/ui/cn';

/** The states in our own words, each with an icon, so a state never reads by colour alone. */
export const STATE_LABELS: Record<ChangeoverState | 'awaiting', { label: string; hint: string }> = {
  drafting: { label: 'Drafting', hint: 'The proposal follows the cell’s latest version while it is edited in the workspace.' },
  checked: { label: 'Under check', hint: 'The proposal is pinned: proofs and scenario checks cover this version.' },
  awaiting: { label: 'Awaiting countersignature', hint: 'Signed by the person who opened it; a second person countersigns.' },
  'signed-off': { label: 'Signed off', hint: 'Signed and countersigned; the record is fixed.' },
  'rolled-back': { label: 'Rolled back', hint: 'The base was put back as the cell’s current version after sign-off.' },
  withdrawn: { label: 'Abandoned', hint: 'The proposal was abandoned before sign-off; the base is current again.' },
};

const ICONS = { drafting: PencilLine, checked: ListChecks, awaiting: Hourglass, 'signed-off': BadgeCheck, 'rolled-back': Undo2, withdrawn: Ban } as const;
const TONES = {
  drafting: 'border-slate-300 bg-white text-slate-700',
  checked: 'border-accent-300 bg-accent-50 text-accent-900',
  awaiting: 'border-accent-300 bg-accent-50 text-accent-900',
  'signed-off': 'border-accent-600 bg-accent-700 text-white',
  'rolled-back': 'border-slate-400 bg-slate-100 text-slate-800',
  withdrawn: 'border-slate-300 bg-slate-100 text-slate-600',
} as const;

/** The state a person reads: "under check" becomes "awaiting countersignature" once the opener has signed. */
export function displayState(co: Pick<Changeover, 'state' | 'signedBy'>): keyof typeof STATE_LABELS {
  return co.state === 'checked' && co.signedBy ? 'awaiting' : co.state;
}

export function StateBadge({ changeover, className }: { changeover: Pick<Changeover, 'state' | 'signedBy'>; className?: string }) {
  const s = displayState(changeover);
  const Icon = ICONS[s];
  return (
    <span
      data-testid="changeover-state"
      data-state={s}
      title={STATE_LABELS[s].hint}
      className={cn('inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium', TONES[s], className)}
    >
      <Icon aria-hidden className="h-3.5 w-3.5" />
      {STATE_LABELS[s].label}
    </span>
  );
}
