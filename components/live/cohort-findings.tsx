'use client';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { Findings } from '@/lib/live/findings';

// The accent teal and a neutral slate: found/passed in the accent, missed/failed in slate, never
// signal colours (those mean device states in Cellwright).
const ACCENT = '#0f766e';
const SLATE = '#64748b';

function Figure({ title, summary, children, table }: { title: string; summary: string; children: React.ReactNode; table: React.ReactNode }) {
  return (
    <figure className="rounded-lg border border-slate-200 bg-white p-4" aria-label={title}>
      <figcaption className="mb-1 text-base font-semibold text-slate-900">{title}</figcaption>
      <p className="mb-3 text-sm text-slate-600">{summary}</p>
      <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
        <div className="h-56" aria-hidden>
          {children}
        </div>
        <div className="relative overflow-x-auto text-sm">{table}</div>
      </div>
    </figure>
  );
}

function Table({ head, rows }: { head: string[]; rows: (string | number)[][] }) {
  return (
    <table className="w-full text-left">
      <thead>
        <tr className="border-b border-slate-200 text-xs text-slate-500">
          {head.map((h) => (
            <th key={h} scope="col" className="py-1 pr-2 font-medium">
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((r, i) => (
          <tr key={i} className="border-b border-slate-100">
            {r.map((c, j) => (
              <td key={j} className={j === 0 ? 'py-1 pr-2' : 'py-1 pr-2 font-mono'}>
                {c}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** What the cohort found on a closed assignment, as charts with the same figures in a table beside each. */
export function CohortFindings({ findings: f, csvHref }: { findings: Findings; csvHref: string }) {
  const median = f.diagnosis.medianMs === null ? 'no correct diagnosis' : `median ${(f.diagnosis.medianMs / 60_000).toFixed(1)} min of cell time`;
  const worst = f.rules.find((r) => r.failed > 0);
  return (
    <div className="space-y-4" data-testid="cohort-findings">
      <p className="text-sm text-slate-600">
        {f.submitted} of {f.students} students submitted.{' '}
        <a href={csvHref} className="font-medium text-accent-700 underline" download>
          Download these figures (CSV)
        </a>
      </p>
      <Figure
        title="Fault cards found and missed"
        summary={f.faults.map((x) => `${x.label}: found by ${x.found}, missed by ${x.missed}`).join('; ') || 'The drill has no hidden fault cards.'}
        table={<Table head={['Fault card', 'Found', 'Missed']} rows={f.faults.map((x) => [x.label, x.found, x.missed])} />}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart accessibilityLayer={false} data={f.faults} layout="vertical" margin={{ left: 8, right: 8 }}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis type="number" allowDecimals={false} />
            <YAxis type="category" dataKey="label" width={150} tick={{ fontSize: 11 }} />
            <Tooltip />
            <Legend />
            <Bar dataKey="found" name="Found" stackId="a" fill={ACCENT} />
            <Bar dataKey="missed" name="Missed" stackId="a" fill={SLATE} />
          </BarChart>
        </ResponsiveContainer>
      </Figure>
      <Figure
        title="Time to a correct diagnosis"
        summary={`${f.diagnosis.correct} of ${f.submitted} named the fault's kind and place; ${median}.`}
        table={<Table head={['Cell time', 'Runs']} rows={f.diagnosis.buckets.map((b) => [b.label, b.count])} />}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart accessibilityLayer={false} data={f.diagnosis.buckets}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis dataKey="label" />
            <YAxis allowDecimals={false} />
            <Tooltip />
            <Bar dataKey="count" name="Runs" fill={ACCENT} />
          </BarChart>
        </ResponsiveContainer>
      </Figure>
      <Figure
        title="Grade distribution"
        summary={f.grades.filter((g) => g.count).map((g) => `${g.label}: ${g.count}`).join(', ') || 'No grades yet.'}
        table={<Table head={['Grade', 'Runs']} rows={f.grades.map((g) => [g.label, g.count])} />}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart accessibilityLayer={false} data={f.grades}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis dataKey="label" />
            <YAxis allowDecimals={false} />
            <Tooltip />
            <Bar dataKey="count" name="Runs" fill={ACCENT} />
          </BarChart>
        </ResponsiveContainer>
      </Figure>
      <Figure
        title="Grading rules most often failed"
        summary={worst ? `Most failed: ${worst.label}, by ${worst.failed} of ${f.submitted}.` : 'No rule failed.'}
        table={<Table head={['Rule', 'Failed', 'Inconclusive', 'Passed']} rows={f.rules.map((r) => [r.label, r.failed, r.inconclusive, r.passed])} />}
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart accessibilityLayer={false} data={f.rules} layout="vertical" margin={{ left: 8, right: 8 }}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis type="number" allowDecimals={false} />
            <YAxis type="category" dataKey="label" width={150} tick={{ fontSize: 11 }} />
            <Tooltip />
            <Legend />
            <Bar dataKey="failed" name="Failed" stackId="a" fill={SLATE} />
            <Bar dataKey="inconclusive" name="Inconclusive" stackId="a" fill="#cbd5e1" />
            <Bar dataKey="passed" name="Passed" stackId="a" fill={ACCENT} />
          </BarChart>
        </ResponsiveContainer>
      </Figure>
    </div>
  );
}
