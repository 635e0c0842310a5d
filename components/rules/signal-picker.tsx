'use client';
/**
 * A signal picker: a search box over a cell's signals (by label, address, wire, device or
 * block) with a list to choose from. It is a combobox in the ARIA sense — arrow keys move
 * through the list, Enter chooses, Escape closes — and the chosen signal shows as its label
 * with the address beside it, so a lead reads "Front guard %IX0.4", not an address alone.
 */
import { useId, useMemo, useRef, useState } from 'react';
import { cn } from '@/components/ui/cn';
import { searchSignals, type SignalOption } from './signal-catalogue';

type Props = {
  options: readonly SignalOption[];
  value: string;
  onChange: (value: string) => void;
  /** Accessible name, e.g. "While — signal". */
  label: string;
  invalid?: boolean;
  disabled?: boolean;
  className?: string;
};

const KIND_WORDS: Record<SignalOption['kind'], string> = {
  input: 'input',
  output: 'output',
  memory: 'memory',
  point: 'robot point',
  handshake: 'handshake',
  device: 'device',
  wire: 'wire',
  arm: 'arm',
  controller: 'controller',
  block: 'logic',
  fault: 'fault',
  link: 'link',
};

export function SignalPicker({ options, value, onChange, label, invalid, disabled, className }: Props) {
  const id = useId();
  const listId = `${id}-list`;
  const chosen = options.find((o) => o.value === value);
  const [query, setQuery] = useState<string | null>(null);
  const [active, setActive] = useState(0);
  const inputRef = useRef<HTMLInputElement>(null);
  const open = query !== null;
  const found = useMemo(() => (open ? searchSignals(options, query, 40) : []), [open, options, query]);
  const shown = chosen ? `${chosen.label === chosen.code ? '' : `${chosen.label} · `}${chosen.code}` : value;

  const choose = (o: SignalOption) => {
    onChange(o.value);
    setQuery(null);
  };

  return (
    <div className={cn('relative min-w-0', className)}>
      <input
        ref={inputRef}
        role="combobox"
        aria-label={label}
        aria-expanded={open}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={open && found[active] ? `${id}-opt-${active}` : undefined}
        aria-invalid={invalid || (value !== '' && !chosen) || undefined}
        disabled={disabled}
        placeholder="Search by name, address or wire…"
        value={open ? query : shown}
        title={chosen ? `${chosen.code} — ${chosen.detail}` : value || undefined}
        onFocus={(e) => {
          setQuery('');
          setActive(0);
          e.currentTarget.select();
        }}
        onChange={(e) => {
          setQuery(e.target.value);
          setActive(0);
        }}
        onBlur={() => setQuery(null)}
        onKeyDown={(e) => {
          if (!open) return;
          if (e.key === 'ArrowDown') {
            e.preventDefault();
            setActive((a) => Math.min(a + 1, found.length - 1));
          } else if (e.key === 'ArrowUp') {
            e.preventDefault();
            setActive((a) => Math.max(a - 1, 0));
          } else if (e.key === 'Enter') {
            e.preventDefault();
            if (found[active]) choose(found[active]);
          } else if (e.key === 'Escape') {
            setQuery(null);
          }
        }}
        className={cn(
          'block w-full rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30 aria-[invalid=true]:border-red-500',
          !open && chosen && 'font-medium',
        )}
      />
      {open ? (
        <ul id={listId} role="listbox" aria-label={`${label}: matching signals`} className="absolute z-30 mt-1 max-h-72 w-full min-w-[22rem] overflow-auto rounded-md border border-slate-300 bg-white py-1 text-sm shadow-lg">
          {found.length === 0 ? <li className="px-3 py-2 text-slate-500">No signal of this cell matches “{query}”.</li> : null}
          {found.map((o, i) => (
            <li
              key={o.value}
              id={`${id}-opt-${i}`}
              role="option"
              aria-selected={i === active}
              // Chosen on mouse down, before the input's blur closes the list.
              onMouseDown={(e) => {
                e.preventDefault();
                choose(o);
              }}
              onMouseEnter={() => setActive(i)}
              className={cn('cursor-pointer px-3 py-1.5', i === active && 'bg-accent-50')}
            >
              <span className="flex items-baseline gap-2">
                <span className="font-medium text-slate-900">{o.label}</span>
                <span className="font-mono text-xs text-slate-600">{o.code}</span>
                <span className="ml-auto shrink-0 text-[11px] uppercase tracking-wide text-slate-400">{KIND_WORDS[o.kind]}</span>
              </span>
              <span className="block truncate text-xs text-slate-500">{o.detail}</span>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
