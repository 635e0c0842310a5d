'use client';
/**
 * A violated interlock rule's counterexample, played on the version's own cell: the input
 * sequence the prover found (each scan's %IX inputs, forced at the scan times) runs in the
 * replay player, the scope opens on the rule's signals and the inputs that matter, and the
 * scan after which the rule is broken is marked. A table lists the sequence scan by scan.
 */
import { cn } from '@/components/ui/cn';
import { ReplayPlayer } from '@/components/replay/run-replay';
import { formatCellTime } from '@/components/workspace/format';
import type { CellDocument, LoggedEvent } from '@/simulator';

export type CounterexampleViewProps = {
  document: CellDocument;
  events: LoggedEvent[];
  failsAtMs: number;
  endMs: number;
  scanPeriodMs: number;
  ruleTitle: string;
  /** The inputs that can influence the rule, and the rule's own signals. */
  inputs: string[];
  signals: string[];
  labels: Record<string, string>;
  scans: { inputs: Record<string, boolean>; signals: Record<string, boolean> }[];
};

export function CounterexampleView(props: CounterexampleViewProps) {
  const { document, events, failsAtMs, endMs, scanPeriodMs, ruleTitle, inputs, signals, labels, scans } = props;
  const shown = [...new Set([...signals, ...inputs])];
  // A window a little longer than the run, in 50 ms steps, so a few scans fill the plot.
  const window = Math.max(50, Math.ceil((endMs * 1.25) / 50) * 50);
  const columns = [...inputs, ...signals.filter((s) => !inputs.includes(s))];
  return (
    <div className="space-y-6">
      <section aria-label="Input sequence" className="rounded-md border border-slate-200 bg-white p-3">
        <h2 className="mb-2 text-sm font-semibold text-slate-700">The input sequence, scan by scan</h2>
        <div className="relative overflow-x-auto">
          <table className="min-w-full text-xs" data-testid="counterexample-scans">
            <thead>
              <tr className="border-b border-slate-200 text-left">
                <th className="py-1 pr-3 font-medium">Scan</th>
                <th className="py-1 pr-3 font-medium">Cell time</th>
                {columns.map((c) => (
                  <th key={c} className="py-1 pr-3 font-medium">
                    <span className="font-mono">{c}</span>
                    {labels[c] ? <span className="block font-normal text-slate-500">{labels[c]}</span> : null}
                    <span className="block font-normal text-slate-500">{inputs.includes(c) ? 'input' : 'rule signal'}</span>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {scans.map((s, k) => {
                const failing = k === scans.length - 1;
                return (
                  <tr key={k} className={cn('border-b border-slate-100', failing && 'bg-red-50')} data-testid={failing ? 'failing-scan' : undefined}>
                    <td className="py-1 pr-3 font-mono">
                      {k + 1}
                      {failing ? <span className="ml-1 font-sans font-semibold text-red-700">rule broken</span> : null}
                    </td>
                    <td className="py-1 pr-3 font-mono">{formatCellTime((k + 1) * scanPeriodMs)}</td>
                    {columns.map((c) => {
                      const v = inputs.includes(c) ? s.inputs[c] : s.signals[c];
                      return (
                        <td key={c} className={cn('py-1 pr-3 font-mono', v ? 'font-bold text-accent-800' : 'text-slate-600')}>
                          {v ? 'ON' : 'off'}
                        </td>
                      );
                    })}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <p className="mt-2 text-xs text-slate-500">
          Scan k reads its inputs at k × {scanPeriodMs} ms; the replay forces those inputs at those times (the forces stay on at the end, so the workspace shows the broken state).
          Inputs not listed cannot influence this rule.
        </p>
      </section>
      <ReplayPlayer
        document={document}
        faults={null}
        seed={null}
        hiddenVisible
        mode="practice"
        violation={{ timeMs: failsAtMs, rule: ruleTitle, message: 'the rule is broken after this scan' }}
        events={events}
        endMs={endMs}
        faultTimes={[]}
        startAtMs={endMs}
        scope={{ initialSignals: shown, marks: [{ timeMs: failsAtMs, label: 'rule broken' }], windows: [window, 2000, 10_000] }}
      />
    </div>
  );
}
