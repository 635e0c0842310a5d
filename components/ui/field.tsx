import { forwardRef } from 'react';
import type { InputHTMLAttributes, ReactNode, TextareaHTMLAttributes } from 'react';
import { cn } from './cn';

const inputClass =
  'block w-full rounded-md border border-slate-300 bg-white px-3 py-2 text-sm text-slate-900 shadow-sm placeholder:text-slate-400 focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30 aria-[invalid=true]:border-red-500';

interface FieldProps {
  id: string;
  label: string;
  error?: string;
  hint?: string;
}

/** The aria attributes that tie a control to its error and hint paragraphs. */
function controlAria(id: string, error?: string, hint?: string) {
  const describedBy = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(' ') || undefined;
  return { 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy };
}

/** Label above, control, then the hint, replaced by the error (announced) when there is one. */
function FieldFrame({ id, label, error, hint, className, children }: FieldProps & { className?: string; children: ReactNode }) {
  return (
    <div className={cn('space-y-1', className)}>
      <label htmlFor={id} className="block text-sm font-medium text-slate-700">
        {label}
      </label>
      {children}
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-xs text-slate-500">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-xs text-red-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A labelled input; the error is announced and tied to the input with aria-describedby. */
export const TextField = forwardRef<HTMLInputElement, FieldProps & InputHTMLAttributes<HTMLInputElement>>(function TextField(
  { id, label, error, hint, className, ...props },
  ref,
) {
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint} className={className}>
      <input ref={ref} id={id} {...controlAria(id, error, hint)} className={inputClass} {...props} />
    </FieldFrame>
  );
});

/** A labelled textarea, tied to its error and hint like TextField. */
export const TextAreaField = forwardRef<HTMLTextAreaElement, FieldProps & TextareaHTMLAttributes<HTMLTextAreaElement>>(
  function TextAreaField({ id, label, error, hint, className, ...props }, ref) {
    return (
      <FieldFrame id={id} label={label} error={error} hint={hint} className={className}>
        <textarea ref={ref} id={id} {...controlAria(id, error, hint)} className={inputClass} {...props} />
      </FieldFrame>
    );
  },
);
