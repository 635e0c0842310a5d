'use client';
/**
 * Where the hidden fault is (the drill's answer), picked from the base cell: one place — or
 * two, for swapped wires — and as many equivalent answers as the trainer accepts (a sensor or
 * the wire it is on). Kept in the grader's text form (`part|w-part`, `w-start,w-reset`).
 */
import { useState } from 'react';
import { Plus, Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { cn } from '@/components/ui/cn';
import type { CellDocument } from '@/simulator';
import { allPlaces, formatAnswer, parseAnswer, type Place } from './fault-places';
import { inputCls } from './form-bits';

type Props = { value: string; onChange: (v: string) => void; document: CellDocument | null; pair: boolean; invalid?: boolean };

const GROUP_WORDS: Record<Place['group'], string> = { device: 'Devices', wire: 'Wires', module: 'Modules', 'point-map row': 'Point-map rows' };

function PlaceOptions({ places, current }: { places: Place[]; current: string }) {
  const groups = (Object.keys(GROUP_WORDS) as Place['group'][]).map((g) => [g, places.filter((p) => p.group === g)] as const).filter(([, ps]) => ps.length > 0);
  return (
    <>
      <option value="">Choose a place…</option>
      {current && !places.some((p) => p.id.toLowerCase() === current.toLowerCase()) ? <option value={current}>{current} (not in this cell)</option> : null}
      {groups.map(([g, ps]) => (
        <optgroup key={g} label={GROUP_WORDS[g]}>
          {ps.map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}
            </option>
          ))}
        </optgroup>
      ))}
    </>
  );
}

export function AnswerPlaces({ value, onChange, document, pair, invalid }: Props) {
  const places = document ? allPlaces(document) : [];
  const fromValue = () => {
    const parsed = parseAnswer(value);
    return parsed.length > 0 ? parsed : [[]];
  };
  // Rows are kept here so an equivalent answer not chosen yet has a row to choose it in.
  const [answers, setAnswers] = useState<string[][]>(fromValue);
  // Only an outside change of the value (a reset, a loaded drill) re-reads it.
  const [seen, setSeen] = useState(value);
  if (seen !== value) {
    setSeen(value);
    if (formatAnswer(answers) !== value) setAnswers(fromValue());
  }
  const set = (next: string[][]) => {
    setAnswers(next.length > 0 ? next : [[]]);
    setSeen(formatAnswer(next));
    onChange(formatAnswer(next));
  };
  const canonical = (id: string) => places.find((p) => p.id.toLowerCase() === id.toLowerCase())?.id ?? id;
  return (
    <div className="space-y-2" data-testid="answer-places">
      {answers.map((a, i) => (
        <div key={i} className="flex flex-wrap items-center gap-2">
          {i > 0 ? <span className="text-xs font-semibold uppercase text-slate-500">or</span> : null}
          <select
            aria-label={i === 0 ? 'Where (the answer)' : `Where (equivalent answer ${i + 1})`}
            aria-invalid={invalid || undefined}
            value={canonical(a[0] ?? '')}
            onChange={(e) => set(answers.map((x, k) => (k === i ? [e.target.value, ...x.slice(1)] : x)))}
            className={cn(inputCls, 'w-auto max-w-md font-mono text-xs')}
          >
            <PlaceOptions places={places} current={a[0] ?? ''} />
          </select>
          {pair || a.length > 1 ? (
            <>
              <span className="text-xs text-slate-500">with</span>
              <select
                aria-label={i === 0 ? 'Where (the second place)' : `Where (equivalent answer ${i + 1}, second place)`}
                value={canonical(a[1] ?? '')}
                onChange={(e) => set(answers.map((x, k) => (k === i ? [x[0] ?? '', e.target.value] : x)))}
                className={cn(inputCls, 'w-auto max-w-md font-mono text-xs')}
              >
                <PlaceOptions places={places.filter((p) => p.id !== a[0])} current={a[1] ?? ''} />
              </select>
            </>
          ) : null}
          {answers.length > 1 ? (
            <Button variant="ghost" className="px-2 py-1" aria-label={`Remove answer ${i + 1}`} onClick={() => set(answers.filter((_, k) => k !== i))}>
              <Trash2 aria-hidden className="h-4 w-4" />
            </Button>
          ) : null}
        </div>
      ))}
      <Button variant="secondary" className="px-2 py-1 text-xs" onClick={() => set([...answers, []])} disabled={answers.some((a) => a.length === 0)}>
        <Plus aria-hidden className="h-3 w-3" /> An equivalent answer
      </Button>
    </div>
  );
}
