'use client';
/**
 * The two kinds of condition row the builder edits: an interlock rule's (a PLC bit that is on
 * or off) and a trace rule's (any signal compared with a value; a bit reads on/off, a text
 * signal such as the controller state offers its values).
 */
import { useState } from 'react';
import { cn } from '@/components/ui/cn';
import { SignalPicker } from './signal-picker';
import type { SignalOption } from './signal-catalogue';

export type BitLeaf = { signal: string; value: 'on' | 'off' };
export type TraceOp = '==' | '!=' | '>' | '>=' | '<' | '<=';
export type TraceLeaf = { signal: string; op: TraceOp; value: number | string | boolean };

export const newBitLeaf = (): BitLeaf => ({ signal: '', value: 'on' });
export const newTraceLeaf = (): TraceLeaf => ({ signal: '', op: '==', value: 1 });

const OPS: { op: TraceOp; words: string }[] = [
  { op: '==', words: 'is' },
  { op: '!=', words: 'is not' },
  { op: '>', words: 'is above' },
  { op: '>=', words: 'is at least' },
  { op: '<', words: 'is below' },
  { op: '<=', words: 'is at most' },
];

const control = 'rounded-md border border-slate-300 bg-white px-2 py-1.5 text-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30';

/** Two buttons, on and off, as one radio group. */
export function OnOff({ value, onChange, name, disabled }: { value: 'on' | 'off'; onChange: (v: 'on' | 'off') => void; name: string; disabled?: boolean }) {
  return (
    <div role="radiogroup" aria-label={`${name}: on or off`} className="inline-flex shrink-0 overflow-hidden rounded-md border border-slate-300">
      {(['on', 'off'] as const).map((v) => (
        <button
          key={v}
          type="button"
          role="radio"
          aria-checked={value === v}
          disabled={disabled}
          onClick={() => onChange(v)}
          className={cn(
            'px-2.5 py-1.5 text-xs font-semibold uppercase',
            value === v ? (v === 'on' ? 'bg-accent-700 text-white' : 'bg-slate-700 text-white') : 'bg-white text-slate-600 hover:bg-slate-100',
          )}
        >
          {v}
        </button>
      ))}
    </div>
  );
}

/** An interlock rule's condition: a PLC bit, on or off. */
export function BitLeafEditor({ leaf, onChange, name, options, disabled }: { leaf: BitLeaf; onChange: (l: BitLeaf) => void; name: string; options: readonly SignalOption[]; disabled?: boolean }) {
  return (
    <div className="flex items-start gap-2">
      <SignalPicker options={options} value={leaf.signal} onChange={(signal) => onChange({ ...leaf, signal })} label={`${name}: signal`} disabled={disabled} className="flex-1" />
      <OnOff value={leaf.value} onChange={(value) => onChange({ ...leaf, value })} name={name} disabled={disabled} />
    </div>
  );
}

const isBitValue = (v: unknown) => v === 0 || v === 1 || v === true || v === false;

/** A typed value from what was typed: a number when it reads as one, else the text. */
export function parseLeafValue(text: string): number | string {
  const t = text.trim();
  return t !== '' && Number.isFinite(Number(t)) ? Number(t) : t;
}

/** A trace rule's condition: any signal compared with a value. */
export function TraceLeafEditor({ leaf, onChange, name, options, disabled }: { leaf: TraceLeaf; onChange: (l: TraceLeaf) => void; name: string; options: readonly SignalOption[]; disabled?: boolean }) {
  const option = options.find((o) => o.value === leaf.signal);
  const toggle = option?.bit && (leaf.op === '==' || leaf.op === '!=') && isBitValue(leaf.value);
  // The typed text follows the stored value when it changes from outside (a reset, a new signal).
  const [text, setText] = useState(String(leaf.value));
  const [seen, setSeen] = useState(leaf.value);
  if (seen !== leaf.value) {
    setSeen(leaf.value);
    setText(String(leaf.value));
  }

  const pick = (signal: string) => {
    const o = options.find((x) => x.value === signal);
    // A new bit starts as "is on"; a text signal as its first value; anything else keeps what was there.
    if (o?.bit) onChange({ signal, op: '==', value: 1 });
    else if (o?.texts) onChange({ signal, op: leaf.op === '!=' ? '!=' : '==', value: o.texts.includes(String(leaf.value)) ? leaf.value : o.texts[0] });
    else onChange({ ...leaf, signal });
  };

  return (
    <div className="flex flex-wrap items-start gap-2">
      <SignalPicker options={options} value={leaf.signal} onChange={pick} label={`${name}: signal`} disabled={disabled} className="min-w-[14rem] flex-1" />
      {toggle ? (
        <OnOff value={(leaf.op === '==') === (leaf.value === 1 || leaf.value === true) ? 'on' : 'off'} onChange={(v) => onChange({ ...leaf, op: '==', value: v === 'on' ? 1 : 0 })} name={name} disabled={disabled} />
      ) : (
        <>
          <select aria-label={`${name}: comparison`} value={leaf.op} disabled={disabled} onChange={(e) => onChange({ ...leaf, op: e.target.value as TraceOp })} className={control}>
            {OPS.filter((o) => !option?.texts || o.op === '==' || o.op === '!=').map((o) => (
              <option key={o.op} value={o.op}>
                {o.words}
              </option>
            ))}
          </select>
          {option?.texts ? (
            <select aria-label={`${name}: value`} value={String(leaf.value)} disabled={disabled} onChange={(e) => onChange({ ...leaf, value: e.target.value })} className={control}>
              {option.texts.map((t) => (
                <option key={t} value={t}>
                  {t}
                </option>
              ))}
            </select>
          ) : (
            <input
              aria-label={`${name}: value`}
              value={text}
              disabled={disabled}
              onChange={(e) => setText(e.target.value)}
              onBlur={() => onChange({ ...leaf, value: parseLeafValue(text) })}
              className={cn(control, 'w-24 font-mono')}
            />
          )}
        </>
      )}
    </div>
  );
}
