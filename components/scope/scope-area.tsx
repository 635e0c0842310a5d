'use client';
import { useMemo, useState, type MouseEvent } from 'react';
import { cn } from '@/components/ui/cn';
import { formatCellTime } from '@/components/workspace/format';
import { useScopeData } from './scope-context';
import { snapToEdge } from './edges';
import type { SignalHistory } from './scope-recorder';
import { useScope } from './use-scope';

const WINDOWS = [2000, 10_000, 30_000];
const PLOT_W = 860;
/** Room left of the plot for the address, its live value and the wired device's label. */
const LABEL_W = 220;
/** Longest label drawn in a lane heading (about what fits LABEL_W at the small size); the full text is in the hover title. */
const LANE_LABEL_CHARS = 40;
const LANE_H = 38;
const AXIS_H = 22;
/** Cursor clicks snap to an edge closer than this many pixels. */
const SNAP_PX = 8;

const isBitKey = (k: string) => /^%[IQM]X/.test(k) || /^(DI|DO|TI|TO)\d/.test(k);

/** A labelled instant drawn across the plot (a counterexample's failing scan, say). */
export type ScopeMark = { timeMs: number; label: string };

type ScopeProps = {
  /** Signals shown until the user picks others (default: the first six bits). */
  initialSignals?: string[];
  /** Instants marked across every lane. */
  marks?: ScopeMark[];
  /** Window lengths offered, in ms (default 2 s, 10 s, 30 s); the first is the initial one. */
  windows?: number[];
};

/** Timing diagram of chosen signals over a rolling window, with two cursors and the time between them. */
export function ScopeArea({ initialSignals, marks = [], windows = WINDOWS }: ScopeProps = {}) {
  const [frozen, setFrozen] = useState(false);
  const data = useScopeData(frozen);
  const { labels } = useScope();
  const keys = useMemo(() => [...data.signals].sort(), [data.signals]);
  const [chosen, setChosen] = useState<string[] | null>(initialSignals ?? null);
  const shown = (chosen ?? keys.filter(isBitKey).slice(0, 6)).filter((k) => keys.includes(k));
  const [windowMs, setWindowMs] = useState(windows === WINDOWS ? 10_000 : windows[0]);
  const [cursors, setCursors] = useState<{ a: number | null; b: number | null }>({ a: null, b: null });
  const [next, setNext] = useState<'a' | 'b'>('a');

  const end = data.endMs;
  const start = Math.max(0, end - windowMs);
  const historyOf = (k: string): SignalHistory => data.histories.get(k) ?? [];
  const x = (t: number) => LABEL_W + ((t - start) / windowMs) * PLOT_W;
  const height = AXIS_H + shown.length * LANE_H + 8;

  const toggle = (k: string) => setChosen((c) => {
    const base = c ?? shown;
    return base.includes(k) ? base.filter((e) => e !== k) : [...base, k];
  });

  const place = (e: MouseEvent<SVGSVGElement>) => {
    const rect = e.currentTarget.getBoundingClientRect();
    const px = ((e.clientX - rect.left) / rect.width) * (LABEL_W + PLOT_W);
    if (px < LABEL_W) return;
    const t = start + ((px - LABEL_W) / PLOT_W) * windowMs;
    const snapped = Math.round(snapToEdge(shown.map(historyOf), t, (SNAP_PX / PLOT_W) * windowMs));
    const which = e.shiftKey ? 'b' : next;
    setCursors((c) => ({ ...c, [which]: snapped }));
    setNext(which === 'a' ? 'b' : 'a');
  };

  const delta = cursors.a !== null && cursors.b !== null ? Math.abs(cursors.b - cursors.a) : null;

  return (
    <div className="flex flex-col gap-3 lg:flex-row">
      <fieldset className="w-full shrink-0 rounded-md border border-slate-300 bg-white p-2 lg:w-72">
        <legend className="px-1 text-xs font-semibold text-slate-700">Signals</legend>
        <div className="max-h-96 space-y-0.5 overflow-y-auto">
          {keys.length === 0 ? <p className="text-xs text-slate-500">Waiting for the first samples…</p> : null}
          {keys.map((k) => (
            <label key={k} className="flex items-start gap-2 text-xs">
              <input type="checkbox" checked={shown.includes(k)} onChange={() => toggle(k)} className="mt-0.5 accent-accent-700" />
              <span className="min-w-0 break-words">
                <span className="font-mono">{k}</span>
                {labels[k] ? <span className="text-[11px] text-slate-500"> · {labels[k]}</span> : null}
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      <div className="min-w-0 flex-1 space-y-2">
        <div className="flex flex-wrap items-center gap-3 text-sm">
          <label className="flex items-center gap-1">
            Window
            <select value={windowMs} onChange={(e) => setWindowMs(Number(e.target.value))} className="rounded border border-slate-300 px-1 py-0.5">
              {windows.map((w) => (
                <option key={w} value={w}>
                  {w < 1000 ? `${w} ms` : `${w / 1000} s`}
                </option>
              ))}
            </select>
          </label>
          <label className="flex items-center gap-1">
            <input type="checkbox" checked={frozen} onChange={(e) => setFrozen(e.target.checked)} className="accent-accent-700" /> Hold display
          </label>
          <span className="text-xs text-slate-600">Click the plot to place cursor {next.toUpperCase()} (Shift-click: B); clicks snap to a nearby edge.</span>
          <button type="button" onClick={() => setCursors({ a: null, b: null })} className="rounded border border-slate-300 bg-white px-2 py-0.5 text-xs hover:bg-slate-100">
            Clear cursors
          </button>
        </div>
        <div className="overflow-x-auto rounded-md border border-slate-300 bg-slate-900">
          <svg
            role="img"
            aria-label={`Timing diagram of ${shown.join(', ') || 'no signals'}`}
            viewBox={`0 0 ${LABEL_W + PLOT_W} ${height}`}
            className="w-full min-w-[640px] cursor-crosshair"
            onClick={place}
            data-testid="scope-plot"
          >
            <TimeAxis start={start} windowMs={windowMs} x={x} height={height} />
            {shown.map((k, i) => (
              <Lane key={k} name={k} label={labels[k]} history={historyOf(k)} top={AXIS_H + i * LANE_H} x={x} start={start} end={end} />
            ))}
            {marks.map((m) =>
              m.timeMs >= start && m.timeMs <= end ? (
                <g key={`${m.timeMs}-${m.label}`} data-testid="scope-mark">
                  <line x1={x(m.timeMs)} x2={x(m.timeMs)} y1={AXIS_H - 4} y2={height} stroke="#ef4444" strokeWidth={2} />
                  {/* Left of the line, unless that would run into the lane labels. */}
                  <text x={x(m.timeMs) - LABEL_W < 90 ? x(m.timeMs) + 4 : x(m.timeMs) - 3} y={AXIS_H - 6} fontSize={10} fill="#fca5a5" textAnchor={x(m.timeMs) - LABEL_W < 90 ? 'start' : 'end'} fontWeight={700}>
                    {m.label}
                  </text>
                </g>
              ) : null,
            )}
            {(['a', 'b'] as const).map((c) =>
              cursors[c] !== null && cursors[c]! >= start ? (
                <g key={c}>
                  <line x1={x(cursors[c]!)} x2={x(cursors[c]!)} y1={AXIS_H - 4} y2={height} stroke={c === 'a' ? '#5eead4' : '#fbbf24'} strokeWidth={1.5} strokeDasharray="4 3" />
                  <text x={x(cursors[c]!) + 3} y={AXIS_H - 6} fontSize={11} fill={c === 'a' ? '#5eead4' : '#fbbf24'} fontWeight={700}>
                    {c.toUpperCase()}
                  </text>
                </g>
              ) : null,
            )}
          </svg>
        </div>
        <dl className="flex flex-wrap gap-x-6 gap-y-1 text-sm" aria-live="polite">
          <Cursor label="Cursor A" value={cursors.a} />
          <Cursor label="Cursor B" value={cursors.b} />
          <div className="flex gap-1.5">
            <dt className="text-slate-600">B − A</dt>
            <dd className="font-mono font-semibold" data-testid="scope-delta">
              {delta === null ? '—' : `${delta} ms`}
            </dd>
          </div>
        </dl>
        <p className="text-xs text-slate-500">Edges are recorded at the cell time they happen (1 ms steps), whatever the run speed; the view refreshes with each drawn frame.</p>
      </div>
    </div>
  );
}

function Cursor({ label, value }: { label: string; value: number | null }) {
  return (
    <div className="flex gap-1.5">
      <dt className="text-slate-600">{label}</dt>
      <dd className="font-mono">{value === null ? '—' : formatCellTime(value)}</dd>
    </div>
  );
}

function TimeAxis({ start, windowMs, x, height }: { start: number; windowMs: number; x: (t: number) => number; height: number }) {
  const step = windowMs / 10;
  const first = Math.ceil(start / step) * step;
  const ticks: number[] = [];
  for (let t = first; t <= start + windowMs; t += step) ticks.push(t);
  return (
    <g>
      {ticks.map((t) => (
        <g key={t}>
          <line x1={x(t)} x2={x(t)} y1={AXIS_H - 2} y2={height} stroke="#334155" strokeWidth={1} />
          <text x={x(t)} y={12} fontSize={10} fill="#94a3b8" textAnchor="middle" fontFamily="var(--font-mono)">
            {(t / 1000).toFixed(windowMs <= 200 ? 3 : windowMs <= 2000 ? 2 : 1)}s
          </text>
        </g>
      ))}
    </g>
  );
}

function Lane({ name, label, history, top, x, start, end }: { name: string; label: string | undefined; history: SignalHistory; top: number; x: (t: number) => number; start: number; end: number }) {
  const bit = isBitKey(name);
  // The value in force at the window start, then every change inside the window.
  const firstInside = history.findIndex((h) => h.t > start);
  const from = firstInside === -1 ? Math.max(0, history.length - 1) : Math.max(0, firstInside - 1);
  const pts = history.slice(from).map((h) => ({ t: Math.max(h.t, start), v: h.v }));
  const hi = top + 6;
  const lo = top + LANE_H - 8;
  const min = bit ? 0 : Math.min(0, ...pts.map((p) => p.v));
  const max = bit ? 1 : Math.max(1, ...pts.map((p) => p.v));
  const y = (v: number) => lo - ((v - min) / (max - min || 1)) * (lo - hi);

  // Step trace: hold each value until the next sample.
  let d = '';
  const onSegments: string[] = [];
  let onFrom: number | null = null;
  pts.forEach((p, i) => {
    const tNext = i + 1 < pts.length ? pts[i + 1].t : end;
    const yy = y(bit ? (p.v !== 0 ? 1 : 0) : p.v);
    d += `${i === 0 ? 'M' : 'L'}${x(p.t)},${yy} L${x(tNext)},${yy} `;
    // Consecutive ON samples make one unbroken thick segment.
    if (bit && p.v !== 0 && onFrom === null) onFrom = p.t;
    const endsHere = i + 1 === pts.length || pts[i + 1].v === 0;
    if (bit && onFrom !== null && endsHere) {
      onSegments.push(`M${x(onFrom)},${y(1)} L${x(tNext)},${y(1)}`);
      onFrom = null;
    }
  });
  const last = pts.at(-1);
  return (
    <g data-testid={`scope-lane-${name}`}>
      <line x1={0} x2={LABEL_W + PLOT_W} y1={top + LANE_H} y2={top + LANE_H} stroke="#1e293b" />
      {/* Address on the first line, the wired device or point label under it, smaller and dimmer. */}
      <text x={6} y={top + (label ? 15 : LANE_H / 2 + 4)} fontSize={11} fill="#e2e8f0" fontFamily="var(--font-mono)">
        {name}
      </text>
      {label ? (
        <text x={6} y={top + 29} fontSize={9.5} fill="#94a3b8">
          <title>{label}</title>
          {label.length > LANE_LABEL_CHARS ? `${label.slice(0, LANE_LABEL_CHARS - 1)}…` : label}
        </text>
      ) : null}
      <path d={d} fill="none" stroke="#64748b" strokeWidth={1.25} />
      {/* ON is drawn brighter and thicker on top of the trace, not by colour alone. */}
      {onSegments.map((s, i) => (
        <path key={i} d={s} fill="none" stroke="#5eead4" strokeWidth={3.5} />
      ))}
      {last ? (
        <text x={LABEL_W - 6} y={top + (label ? 15 : LANE_H / 2 + 4)} fontSize={10} textAnchor="end" fill={bit && last.v !== 0 ? '#5eead4' : '#94a3b8'} fontWeight={bit && last.v !== 0 ? 700 : 400} className={cn('font-mono')}>
          {bit ? (last.v !== 0 ? 'ON' : 'off') : last.v}
        </text>
      ) : null}
    </g>
  );
}
