import { cn } from '@/components/ui/cn';

/**
 * A short text mark of a live state (`● PRESSED` / `○ released`), so ON never relies on colour
 * alone. Shared by the panel and field areas. The off text stays dark enough for WCAG 2 AA on
 * the grey front plate as well as on white cards.
 */
export function StateMark({ on, onText, offText }: { on: boolean; onText: string; offText: string }) {
  return <span className={cn('text-[10px] uppercase tracking-wide', on ? 'font-bold text-slate-900' : 'text-slate-700')}>{on ? `● ${onText}` : `○ ${offText}`}</span>;
}
