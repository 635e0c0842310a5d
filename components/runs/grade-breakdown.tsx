import { CheckCircle2, CircleHelp, XCircle } from 'lucide-react';
import { formatCellTime, humanise } from '@/components/workspace/format';
import type { RunBreakdown } from './types';

/** The grade's parts: each rule with its points and first violation, and the diagnosis. */
export function GradeBreakdown({ breakdown }: { breakdown: RunBreakdown }) {
  const icon = (s: string) =>
    s === 'pass' ? <CheckCircle2 aria-label="pass" className="h-4 w-4 text-accent-700" /> : s === 'fail' ? <XCircle aria-label="fail" className="h-4 w-4 text-red-700" /> : <CircleHelp aria-label="inconclusive" className="h-4 w-4 text-slate-500" />;
  const d = breakdown.diagnosis;
  return (
    <table className="w-full text-left text-sm" data-testid="grade-breakdown">
      <thead className="text-xs uppercase tracking-wide text-slate-500">
        <tr>
          <th className="py-1.5">Part</th>
          <th>Result</th>
          <th className="text-right">Points</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-slate-100">
        {breakdown.rules.map((r) => (
          <tr key={r.id}>
            <td className="py-1.5">
              <span className="font-medium">{r.label ?? r.id}</span> <span className="text-xs text-slate-500">({r.kind} rule)</span>
              {r.violation ? (
                <p className="text-xs text-red-800">
                  First violation at <span className="font-mono">{formatCellTime(r.violation.timeMs)}</span>: {r.violation.message}
                </p>
              ) : null}
            </td>
            <td>
              <span className="inline-flex items-center gap-1">
                {icon(r.status)} {r.status}
              </span>
            </td>
            <td className="text-right font-mono">
              {r.earned} / {r.weight}
            </td>
          </tr>
        ))}
        <tr>
          <td className="py-1.5">
            <span className="font-medium">Diagnosis</span>{' '}
            {d.given ? (
              <span className="text-xs text-slate-600">
                ({humanise(d.given.kind)} at <span className="font-mono">{d.given.location}</span>)
              </span>
            ) : null}
            <p className="text-xs text-slate-600">
              Kind {d.kindCorrect ? 'right' : 'wrong'} · place {d.locationCorrect ? 'right' : 'wrong'}
            </p>
          </td>
          <td>
            <span className="inline-flex items-center gap-1">
              {icon(d.earned === d.weight ? 'pass' : d.earned > 0 ? 'inconclusive' : 'fail')} {d.earned === d.weight ? 'right' : d.earned > 0 ? 'half' : 'wrong'}
            </span>
          </td>
          <td className="text-right font-mono">
            {d.earned} / {d.weight}
          </td>
        </tr>
      </tbody>
      <tfoot>
        <tr className="border-t border-slate-300 font-semibold">
          <td className="py-1.5">Total</td>
          <td />
          <td className="text-right font-mono">
            {breakdown.earned} / {breakdown.possible}
          </td>
        </tr>
      </tfoot>
    </table>
  );
}
