import type { ReactNode } from 'react';
import { AlertCircle, CheckCircle2, Info } from 'lucide-react';
import { cn } from './cn';

type Tone = 'info' | 'success' | 'error';

const TONES: Record<Tone, string> = {
  info: 'border-slate-300 bg-white text-slate-700',
  success: 'border-accent-300 bg-accent-50 text-accent-900',
  error: 'border-red-300 bg-red-50 text-red-800',
};

/** An inline message box; errors use role="alert" so screen readers announce them. */
export function Notice({ tone = 'info', children, className }: { tone?: Tone; children: ReactNode; className?: string }) {
  const Icon = tone === 'error' ? AlertCircle : tone === 'success' ? CheckCircle2 : Info;
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={cn('flex gap-2 rounded-md border px-3 py-2 text-sm', TONES[tone], className)}>
      <Icon aria-hidden className="mt-0.5 h-4 w-4 shrink-0" />
      <div>{children}</div>
    </div>
  );
}
