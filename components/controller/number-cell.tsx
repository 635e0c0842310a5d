'use client';
/**
 * A number field in a table row that commits on blur or Enter and snaps back to the stored
 * value when the text is not acceptable. `integer` cells (point-map rows) take whole numbers in
 * [min, max]; decimal cells (poses) need a non-empty finite number, optionally above `min`.
 */
import { blurOnEnter, useDraft } from '@/components/logic/use-draft';
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

function acceptable(text: string, n: number, { min, max, integer, exclusiveMin }: Props): boolean {
  if (integer) return Number.isInteger(n) && n >= min && n <= max;
  return text.trim() !== '' && Number.isFinite(n) && (exclusiveMin ? n > min : n >= min) && n <= max;
}

export function NumberCell(props: Props) {
  const { label, value, disabled, onCommit, integer, className } = props;
  const [text, setText] = useDraft(String(value));
  const commit = () => {
    const n = Number(text);
    if (!acceptable(text, n, props)) return setText(String(value));
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
