'use client';
/**
 * A number field in a table row that commits on blur or Enter and snaps back to the stored
 * value when the text is not acceptable: an empty field is never a number (it is not 0).
 * `integer` cells (point-map rows) take whole numbers in [min, max]; decimal cells (poses)
 * take finite numbers in [min, max], or above `min` with `exclusiveMin`.
 */
import { blurOnEnter, useTextDraft } from '@/components/workspace/use-text-draft';
import { cn } from '@/components/ui/cn';

type Props = {
  label: string;
  value: number;
  min: number;
  max: number;
  disabled: boolean;
  onCommit(v: number): void;
  integer?: boolean;
  exclusiveMin?: boolean;
  className?: string;
};

type Bounds = Pick<Props, 'min' | 'max' | 'integer' | 'exclusiveMin'>;

/** The number a cell's text commits, or null when the cell should snap back. */
export function acceptedNumber(text: string, { min, max, integer, exclusiveMin }: Bounds): number | null {
  // Number('') and Number('  ') are 0: a cleared field would otherwise commit 0.
  if (text.trim() === '') return null;
  const n = Number(text);
  if (!Number.isFinite(n) || (integer && !Number.isInteger(n))) return null;
  if (exclusiveMin ? n <= min : n < min) return null;
  return n <= max ? n : null;
}

export function NumberCell(props: Props) {
  const { label, value, disabled, onCommit, integer, className } = props;
  const [text, setText] = useTextDraft(String(value));
  const commit = () => {
    const n = acceptedNumber(text, props);
    if (n === null) return setText(String(value));
    if (n !== value) onCommit(n);
  };
  return (
    <input
      aria-label={label}
      inputMode={integer ? 'numeric' : 'decimal'}
      className={cn('rounded border border-slate-300 px-1 py-0.5 font-mono text-sm', className)}
      value={text}
      disabled={disabled}
      onChange={(e) => setText(e.target.value)}
      onBlur={commit}
      onKeyDown={blurOnEnter}
    />
  );
}
