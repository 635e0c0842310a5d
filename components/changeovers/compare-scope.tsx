'use client';
/**
 * One scenario's two traces on one scope: for each chosen signal a "base" lane and a
 * "proposal" lane stacked, each labelled, with the stretches where they differ banded on both
 * lanes (a hatch, not only a colour) and rule violations marked. ON is drawn brighter and
 * thicker, as on the workspace scope; text signals (the controller state) are drawn as
 * labelled segments.
 */
import { useId, useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { fetchJson } from '@/lib/api/client';
import { formatCellTime } from '@/components/workspace/format';
import { Notice } from '@/components/ui/notice';
import type { Trace } from '@/simulator';
import type { StoredCheck } from '@/db/changeover-evidence';
import type { SignalOption } from '@/components/rules/signal-catalogue';
import { differences, firstDifference, histories, signalsToShow, type History } from './compare-traces';

type TracesResponse = { check: StoredCheck; traces: { base: Trace | null; proposed: Trace | null } };

const LABEL_W = 230;
const PLOT_W = 840;
const LANE_H = 26;
const GAP = 10;
const AXIS_H = 22;
const WINDOWS = [0, 60_000, 10_000, 2000];

const isBit = (name: string, h: History | undefined) => /^(plc\.%[IQM]X|hs\.|in\.)/.test(name) || name === 'arm.moving' || name === 'ctl.servo' || (h ?? []).every((s) => s.v === 0 || s.v === 1);

export function CompareScope({ changeoverId, checkId, options }: { changeoverId: string; checkId: string; options: readonly SignalOption[] }) {
  const q = useQuery({ queryKey: ['check-traces', changeoverId, checkId], queryFn: () => fetchJson<TracesResponse>(`/api/changeovers/${changeoverId}/checks/${checkId}/traces`), staleTime: Infinity });
  if (q.isPending) return <p className="text-sm text-slate-500">Loading both traces…</p>;
  if (q.isError) return <Notice tone="error">The traces could not be loaded: {q.error.message}</Notice>;
  return <ComparePlot data={q.data} options={options} />;
}

function ComparePlot({ data, options }: { data: TracesResponse; options: readonly SignalOption[] }) {
  const { check, traces } = data;
  const patternId = `differs-${useId().replace(/[^a-zA-Z0-9]/g, '')}`;
  const base = useMemo(() => histories(traces.base), [traces.base]);
  const proposed = useMemo(() => histories(traces.proposed), [traces.proposed]);
  const endMs = Math.max(traces.base?.endMs ?? 0, traces.proposed?.endMs ?? 0, 1);
  const ruleSignals = useMemo(() => {
    const out: string[] = [];
    const walk = (p: unknown) => {
      if (!p || typeof p !== 'object') return;
      const o = p as Record<string, unknown>;
      if (typeof o.signal === 'string') out.push(o.signal);
      for (const k of ['all', 'any']) if (Array.isArray(o[k])) (o[k] as unknown[]).forEach(walk);
      if (o.not) walk(o.not);
    };
    for (const r of check.scenario.rules) {
      walk(r.p);
      if (r.kind === 'after') walk(r.event);
    }
    return out;
  }, [check.scenario.rules]);
  const names = useMemo(() => [...new Set([...base.keys(), ...proposed.keys()])].sort(), [base, proposed]);
  const [chosen, setChosen] = useState<string[]>(() => signalsToShow(base, proposed, endMs, ruleSignals));
  const first = firstDifference(base, proposed, endMs);
  const [windowMs, setWindowMs] = useState(0);
  const span = windowMs === 0 || windowMs >= endMs ? endMs : windowMs;
  const [start, setStart] = useState(() => (first !== null && span < endMs ? Math.max(0, Math.min(endMs - span, first - span / 4)) : 0));
  const from = Math.min(start, Math.max(0, endMs - span));
  const x = (t: number) => LABEL_W + ((Math.min(Math.max(t, from), from + span) - from) / span) * PLOT_W;
  const labelOf = (n: string) => options.find((o) => o.value === n)?.label;
  const laneTop = (i: number, side: 0 | 1) => AXIS_H + i * (2 * LANE_H + GAP) + side * LANE_H;
  const height = AXIS_H + chosen.length * (2 * LANE_H + GAP) + 4;
  const marks = [
    ...check.base.rules.filter((r) => r.status === 'fail' && r.violation).map((r) => ({ side: 0 as const, t: r.violation!.timeMs, rule: r.label ?? r.id })),
    ...check.proposed.rules.filter((r) => r.status === 'fail' && r.violation).map((r) => ({ side: 1 as const, t: r.violation!.timeMs, rule: r.label ?? r.id })),
  ];

  return (
    <div className="space-y-2" data-testid="compare-scope">
      <div className="flex flex-wrap items-center gap-3 text-xs">
        <label className="flex items-center gap-1">
          Window
          <select value={windowMs} onChange={(e) => setWindowMs(Number(e.target.value))} className="rounded border border-slate-300 px-1 py-0.5">
            {WINDOWS.map((w) => (
              <option key={w} value={w}>
                {w === 0 ? 'whole scenario' : `${w / 1000} s`}
              </option>
            ))}
          </select>
        </label>
        {span < endMs ? (
          <label className="flex items-center gap-1">
            from
            <input type="range" min={0} max={endMs - span} step={Math.max(1, Math.round(span / 100))} value={from} onChange={(e) => setStart(Number(e.target.value))} aria-label="Window start" />
            <span className="font-mono">{formatCellTime(from)}</span>
          </label>
        ) : null}
        {first !== null ? (
          <button type="button" className="rounded border border-slate-300 bg-white px-2 py-0.5 hover:bg-slate-100" onClick={() => setStart(Math.max(0, first - span / 4))}>
            First difference at {formatCellTime(first)}
          </button>
        ) : (
          <span className="text-slate-600">The compared signals are the same on both versions.</span>
        )}
        <span className="ml-auto flex items-center gap-3 text-slate-600">
          <span className="inline-flex items-center gap-1">
            <svg aria-hidden width="20" height="12" className="ring-1 ring-amber-400">
              <rect width="20" height="12" fill="#78350f" fillOpacity="0.35" />
              {[0, 6, 12, 18].map((k) => (
                <line key={k} x1={k} y1={12} x2={k + 8} y2={0} stroke="#f59e0b" strokeWidth="1.5" />
              ))}
            </svg>{' '}
            differs
          </span>
          <span className="inline-flex items-center gap-1">
            <span className="inline-block h-3 w-1 bg-red-500" /> rule fails
          </span>
        </span>
      </div>
      <div className="overflow-x-auto rounded-md border border-slate-300 bg-slate-900">
        <svg role="img" aria-label={`Base and proposal traces of ${chosen.join(', ') || 'no signals'}`} viewBox={`0 0 ${LABEL_W + PLOT_W} ${height}`} className="w-full min-w-[640px]">
          <defs>
            <pattern id={patternId} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
              <rect width="6" height="6" fill="#78350f" fillOpacity="0.35" />
              <line x1="0" y1="0" x2="0" y2="6" stroke="#f59e0b" strokeWidth="1.5" />
            </pattern>
          </defs>
          <Axis from={from} span={span} x={x} height={height} />
          {chosen.map((n, i) => {
            const diff = differences(base.get(n), proposed.get(n), endMs);
            return (
              <g key={n} data-testid={`compare-signal-${n}`}>
                {([0, 1] as const).map((side) => {
                  const top = laneTop(i, side);
                  const h = side === 0 ? base.get(n) : proposed.get(n);
                  return (
                    <g key={side}>
                      {diff.map(([a, b], k) =>
                        b >= from && a <= from + span ? <rect key={k} x={x(a)} y={top + 2} width={Math.max(1.5, x(b) - x(a))} height={LANE_H - 4} fill={`url(#${patternId})`} /> : null,
                      )}
                      <text x={6} y={top + 11} fontSize={10.5} fill="#e2e8f0" fontFamily="var(--font-mono)">
                        {side === 0 ? n.replace(/^plc\./, '') : ''}
                      </text>
                      <text x={6} y={top + (side === 0 ? 22 : 11)} fontSize={9} fill="#94a3b8">
                        {side === 0 ? (labelOf(n) ?? '').slice(0, 34) : ''}
                      </text>
                      <text x={LABEL_W - 6} y={top + LANE_H / 2 + 3} fontSize={10} textAnchor="end" fill={side === 0 ? '#cbd5e1' : '#5eead4'} fontWeight={600}>
                        {side === 0 ? `base v${check.base.version}` : `proposal v${check.proposed.version}`}
                      </text>
                      <Lane history={h} top={top} x={x} from={from} to={from + span} bit={isBit(n, h)} endMs={endMs} />
                      <line x1={0} x2={LABEL_W + PLOT_W} y1={top + LANE_H} y2={top + LANE_H} stroke={side === 0 ? '#1e293b' : '#334155'} />
                    </g>
                  );
                })}
              </g>
            );
          })}
          {marks.map((m, k) =>
            m.t >= from && m.t <= from + span
              ? chosen.map((_, i) => (
                  <rect key={`${k}-${i}`} x={x(m.t) - 1.5} y={laneTop(i, m.side)} width={3} height={LANE_H} fill="#ef4444">
                    <title>{`${m.rule} fails on the ${m.side === 0 ? 'base' : 'proposal'} at ${formatCellTime(m.t)}`}</title>
                  </rect>
                ))
              : null,
          )}
        </svg>
      </div>
      <details className="text-xs">
        <summary className="cursor-pointer text-slate-600">Signals shown ({chosen.length} of {names.length})</summary>
        <div className="mt-1 grid max-h-56 grid-cols-2 gap-x-4 overflow-auto md:grid-cols-3">
          {names.map((n) => (
            <label key={n} className="flex items-center gap-1">
              <input type="checkbox" checked={chosen.includes(n)} onChange={() => setChosen((c) => (c.includes(n) ? c.filter((e) => e !== n) : [...c, n]))} className="accent-accent-700" />
              <span className="font-mono">{n}</span>
              {labelOf(n) ? <span className="truncate text-slate-500">{labelOf(n)}</span> : null}
            </label>
          ))}
        </div>
      </details>
    </div>
  );
}

function Axis({ from, span, x, height }: { from: number; span: number; x: (t: number) => number; height: number }) {
  const step = span / 8;
  const ticks = Array.from({ length: 9 }, (_, k) => from + k * step);
  return (
    <g>
      {ticks.map((t, k) => (
        <g key={t}>
          <line x1={x(t)} x2={x(t)} y1={AXIS_H - 2} y2={height} stroke="#334155" />
          <text x={x(t)} y={13} fontSize={10} fill="#94a3b8" textAnchor={k === ticks.length - 1 ? 'end' : 'middle'} fontFamily="var(--font-mono)">
            {(t / 1000).toFixed(span <= 2000 ? 2 : 1)}s
          </text>
        </g>
      ))}
    </g>
  );
}

function Lane({ history, top, x, from, to, bit, endMs }: { history: History | undefined; top: number; x: (t: number) => number; from: number; to: number; bit: boolean; endMs: number }) {
  const h = history ?? [];
  if (h.length === 0) {
    return (
      <text x={LABEL_W + 6} y={top + LANE_H / 2 + 3} fontSize={9.5} fill="#64748b">
        not on this version
      </text>
    );
  }
  const hi = top + 5;
  const lo = top + LANE_H - 5;
  const segments = h
    .map((s, i) => ({ a: s.t, b: i + 1 < h.length ? h[i + 1].t : endMs, v: s.v }))
    .filter((s) => s.b >= from && s.a <= to);
  if (typeof h[0].v === 'string') {
    return (
      <g>
        {segments.map((s, i) => (
          <g key={i}>
            <rect x={x(s.a)} y={hi} width={Math.max(0.5, x(s.b) - x(s.a))} height={lo - hi} fill="none" stroke="#64748b" />
            {x(s.b) - x(s.a) > 30 ? (
              <text x={x(s.a) + 3} y={lo - 4} fontSize={9} fill="#e2e8f0">
                {String(s.v)}
              </text>
            ) : null}
          </g>
        ))}
      </g>
    );
  }
  const nums = h.map((s) => Number(s.v));
  const min = bit ? 0 : Math.min(0, ...nums);
  const max = bit ? 1 : Math.max(1, ...nums);
  const y = (v: number) => lo - ((v - min) / (max - min || 1)) * (lo - hi);
  let d = '';
  segments.forEach((s, i) => {
    d += `${i === 0 ? 'M' : 'L'}${x(s.a)},${y(Number(s.v))} L${x(s.b)},${y(Number(s.v))} `;
  });
  return (
    <g>
      <path d={d} fill="none" stroke="#64748b" strokeWidth={1.25} />
      {bit
        ? segments.filter((s) => Number(s.v) !== 0).map((s, i) => <path key={i} d={`M${x(s.a)},${y(1)} L${x(s.b)},${y(1)}`} stroke="#5eead4" strokeWidth={3.5} />)
        : null}
    </g>
  );
}
