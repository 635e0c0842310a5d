/** Small pieces the drill editor's sections share: the input look, a labelled control, a field error. */
import type { ReactNode } from 'react';
import { cn } from '@/components/ui/cn';

export const inputCls =
  'block w-full rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30 aria-[invalid=true]:border-red-500';
export const labelCls = 'block text-xs font-medium text-slate-600';

/** Reads a field error by dotted path from react-hook-form's errors. */
export type ErrFn = (path: string) => string | undefined;

export function FieldError({ message }: { message?: string }) {
  return message ? (
    <p role="alert" className="text-xs text-red-700">
      {message}
    </p>
  ) : null;
}

/** One labelled control of the editor, with the control's error under it when it reports one. */
export function Labelled({ id, label, error, className, children }: { id: string; label: ReactNode; error?: string; className?: string; children: ReactNode }) {
  return (
    <div className={cn('space-y-1', className)}>
      <label htmlFor={id} className={labelCls}>
        {label}
      </label>
      {children}
      <FieldError message={error} />
    </div>
  );
}
