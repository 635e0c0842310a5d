'use client';
/**
 * The changeover page's scenario checks: every scenario the cell keeps, re-simulated on the
 * base and on the proposal, with what changed (a rule pass → fail or fail → pass, a side that
 * could not run it, the compared trace's hash) and both traces on one scope. A changed outcome
 * is accepted with a reason before sign-off. The scenarios themselves are listed below with
 * their rules, which the owner can rename and rewrite with the rule builder.
 */
import { useMemo, useState } from 'react';
import Link from 'next/link';
import { CheckCircle2, CircleAlert, Pencil, Play, Trash2 } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { formatDateTime } from '@/lib/format';
import { formatCellTime } from '@/components/workspace/format';
import { fetchJson } from '@/lib/api/client';
import { TraceRuleFields, useTraceSentence } from '@/components/rules/trace-rule-fields';
import type { SignalOption } from '@/components/rules/signal-catalogue';
import type { CheckEvidence } from '@/lib/changeovers/evidence';
import type { OutcomeChange, ScenarioOutcome } from '@/lib/changeovers/scenario-check';
import type { ScenarioSummary } from '@/db/scenarios';
import type { Rule } from '@/simulator';
import { AcceptanceBox } from './acceptance-box';
import { CompareScope } from './compare-scope';
import { RunProgress } from './run-progress';
import { traceOptionsOf, useChangeoverDocuments, useEvidence, useEvidenceMutation } from './use-evidence';

type Props = { changeoverId: string; cellId: string; canEdit: boolean };

const short = (hash: string | null) => (hash ? hash.slice(0, 8) : '—');

function changeText(c: OutcomeChange): string {
  if (c.kind === 'rule') return `rule “${c.label ?? c.rule}”: ${c.from} → ${c.to}`;
  if (c.kind === 'trace') return `trace ${short(c.from)} → ${short(c.to)}`;
  return `the ${c.side === 'base' ? 'base' : 'proposal'} could not run it: ${c.message}`;
}

function Outcome({ o, side }: { o: ScenarioOutcome; side: string }) {
  if (!o.ok) {
    return (
      <div className="text-sm text-red-800" data-testid={`outcome-${side}`}>
        <p className="font-medium">Could not run on v{o.version}</p>
        <p className="text-xs">{o.problems.join('; ')}</p>
      </div>
    );
  }
  const failed = o.rules.filter((r) => r.status !== 'pass');
  return (
    <div className="text-sm" data-testid={`outcome-${side}`}>
      <p className={cn('flex items-center gap-1 font-medium', failed.length ? 'text-red-700' : 'text-accent-800')}>
        {failed.length ? <CircleAlert aria-hidden className="h-4 w-4" /> : <CheckCircle2 aria-hidden className="h-4 w-4" />}v{o.version}:{' '}
        {o.rules.length === 0 ? 'ran (no rules)' : failed.length ? `${failed.length} of ${o.rules.length} rules not passed` : `all ${o.rules.length} rules pass`}
      </p>
      {failed.map((r) => (
        <p key={r.id} className="text-xs text-slate-700">
          {r.label ?? r.id}: {r.status}
          {r.violation ? ` at ${formatCellTime(r.violation.timeMs)}` : ''}
        </p>
      ))}
      <p className="font-mono text-[11px] text-slate-500">trace {short(o.hash)}</p>
    </div>
  );
}

export function ChecksSection({ changeoverId, cellId, canEdit }: Props) {
  const evidence = useEvidence(changeoverId);
  const data = evidence.data;
  const docs = useChangeoverDocuments(changeoverId, data ? { baseVersion: data.changeover.baseVersion, proposedVersion: data.changeover.proposedVersion } : undefined);
  const options = useMemo(() => (docs.data ? traceOptionsOf(docs.data.proposed) : []), [docs.data]);
  const [shown, setShown] = useState<string | null>(null);
  const run = useEvidenceMutation(changeoverId, () => fetchJson(`/api/changeovers/${changeoverId}/checks`, { method: 'POST' }));

  if (evidence.isPending) return <p className="text-sm text-slate-500">Loading the scenario checks…</p>;
  if (evidence.isError || !data) return <Notice tone="error">The scenario checks could not be loaded: {evidence.error?.message}</Notice>;
  const { evidence: ev, scenarios } = data;
  const last = ev.runs.checks;
  const open = ev.open.checks;
  const stale = last && (last.baseVersion !== data.changeover.baseVersion || last.proposedVersion !== data.changeover.proposedVersion || last.inputsSha256 !== ev.current.scenariosSha256);
  const locked = data.changeover.signedBy !== null || !['drafting', 'checked'].includes(data.changeover.state);

  return (
    <section aria-label="Scenario checks" className="space-y-4" data-testid="checks-section">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 className="text-base font-semibold text-slate-900">Scenario checks</h2>
          <p className="max-w-2xl text-sm text-slate-600">
            Every scenario the cell keeps is replayed on the base (v{data.changeover.baseVersion}) and the proposal (v{data.changeover.proposedVersion}); its rules are checked and the
            traces compared. Any change needs a reason before sign-off.
          </p>
        </div>
        {canEdit && !locked ? (
          <Button onClick={() => run.mutate(undefined)} disabled={run.isPending || Boolean(open) || scenarios.length === 0} data-testid="run-checks">
            <Play aria-hidden className="h-4 w-4" /> {last ? 'Run the checks again' : 'Run the checks'}
          </Button>
        ) : null}
      </div>
      {run.error ? <Notice tone="error">{run.error.message}</Notice> : null}
      {ev.failed.checks && !ev.open.checks ? (
        <Notice tone="error">
          The last scenario checks job ({formatDateTime(ev.failed.checks.createdAt)}) failed: {ev.failed.checks.error ?? 'no reason was recorded'}. The outcomes below are from the run before it.
        </Notice>
      ) : null}
      {open ? <RunProgress changeoverId={changeoverId} run={open} what="Checks" /> : null}
      {last ? (
        <p className="text-xs text-slate-500" data-testid="checks-last-run">
          Last checked {formatDateTime(last.finishedAt)} by {last.requestedBy.name}, on version {last.baseVersion} → {last.proposedVersion}.
          {stale ? <span className="font-medium text-amber-800"> The scenarios or versions changed since: run the checks again.</span> : null}
        </p>
      ) : null}

      {ev.checks.length > 0 ? (
        <ul className="space-y-3">
          {ev.checks.map((c: CheckEvidence) => (
            <li key={c.checkId} className={cn('rounded-md border p-3', c.changed ? 'border-amber-300 bg-amber-50/40' : 'border-slate-200 bg-white')} data-testid={`check-${c.name}`}>
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <p className="font-medium text-slate-900">{c.name}</p>
                <p className={cn('text-xs font-semibold uppercase tracking-wide', c.changed ? 'text-amber-900' : 'text-accent-800')} data-testid="check-verdict">
                  {c.changed ? 'outcome changed' : 'unchanged'}
                </p>
              </div>
              <div className="mt-2 grid gap-3 md:grid-cols-3">
                <div>
                  <p className="text-xs font-semibold text-slate-500">Base</p>
                  <Outcome o={c.base} side="base" />
                </div>
                <div>
                  <p className="text-xs font-semibold text-slate-500">Proposal</p>
                  <Outcome o={c.proposed} side="proposed" />
                </div>
                <div>
                  <p className="text-xs font-semibold text-slate-500">What changed</p>
                  {c.changes.length === 0 ? (
                    <p className="text-sm text-slate-600">Nothing: same rule results, same trace.</p>
                  ) : (
                    <ul className="list-disc pl-4 text-sm text-slate-800" data-testid="check-changes">
                      {c.changes.map((x, i) => (
                        <li key={i}>{changeText(x)}</li>
                      ))}
                    </ul>
                  )}
                </div>
              </div>
              <div className="mt-2 flex flex-wrap items-start gap-3">
                <Button variant="secondary" className="px-2 py-1 text-xs" aria-expanded={shown === c.checkId} onClick={() => setShown(shown === c.checkId ? null : c.checkId)}>
                  {shown === c.checkId ? 'Hide the traces' : 'Show both traces'}
                </Button>
                {c.changed ? (
                  <div className="min-w-[18rem] flex-1">
                    <AcceptanceBox changeoverId={changeoverId} target={`checks/${c.checkId}`} what={`the changed outcome of “${c.name}”`} acceptance={c.acceptance} canEdit={canEdit && !locked} />
                  </div>
                ) : null}
              </div>
              {shown === c.checkId ? (
                <div className="mt-3">
                  <CompareScope changeoverId={changeoverId} checkId={c.checkId} options={options} />
                </div>
              ) : null}
            </li>
          ))}
        </ul>
      ) : scenarios.length > 0 ? (
        <p className="text-sm text-slate-600">The checks have not run yet.</p>
      ) : null}

      <ScenarioList cellId={cellId} changeoverId={changeoverId} scenarios={scenarios} options={options} canEdit={canEdit} />
    </section>
  );
}

function ScenarioList({ cellId, changeoverId, scenarios, options, canEdit }: { cellId: string; changeoverId: string; scenarios: ScenarioSummary[]; options: readonly SignalOption[]; canEdit: boolean }) {
  const sentence = useTraceSentence(options);
  const [editing, setEditing] = useState<string | null>(null);
  const remove = useEvidenceMutation(changeoverId, (id: string) => fetchJson(`/api/cells/${cellId}/scenarios/${id}`, { method: 'DELETE' }));
  return (
    <div className="space-y-2">
      <h3 className="text-sm font-semibold text-slate-900">Scenarios the cell keeps ({scenarios.length})</h3>
      {scenarios.length === 0 ? (
        <p className="text-sm text-slate-600">
          None yet. Finish a practice run (or open a drill run) on this cell and choose <span className="font-medium">Keep as scenario</span> on its page.
        </p>
      ) : null}
      <ul className="divide-y divide-slate-200 rounded-md border border-slate-200 bg-white">
        {scenarios.map((s) => (
          <li key={s.id} className="p-3 text-sm" data-testid={`scenario-${s.name}`}>
            {editing === s.id ? (
              <ScenarioEditor cellId={cellId} changeoverId={changeoverId} scenario={s} options={options} onDone={() => setEditing(null)} />
            ) : (
              <div className="flex flex-wrap items-start justify-between gap-2">
                <div className="min-w-0">
                  <p className="font-medium text-slate-900">{s.name}</p>
                  <p className="text-xs text-slate-500">
                    {s.eventCount} events over {formatCellTime(s.durationMs)}
                    {s.faults.length ? ` · ${s.faults.length} fault card${s.faults.length === 1 ? '' : 's'}` : ''}
                    {s.sourceRunId ? (
                      <>
                        {' · '}
                        <Link className="underline" href={`/runs/${s.sourceRunId}`}>
                          from a run
                        </Link>
                      </>
                    ) : null}
                  </p>
                  {s.description ? <p className="text-xs text-slate-600">{s.description}</p> : null}
                  <ul className="mt-1 list-disc pl-4 text-slate-700">
                    {s.rules.map((r) => (
                      <li key={r.id}>{options.length ? sentence(r) : (r.label ?? r.id)}</li>
                    ))}
                    {s.rules.length === 0 ? <li className="text-slate-500">No rules: only its trace is compared.</li> : null}
                  </ul>
                </div>
                {canEdit ? (
                  <div className="flex gap-1">
                    <Button variant="ghost" className="px-2 py-1" aria-label={`Edit scenario “${s.name}”`} onClick={() => setEditing(s.id)} disabled={options.length === 0}>
                      <Pencil aria-hidden className="h-4 w-4" />
                    </Button>
                    <Button variant="ghost" className="px-2 py-1" aria-label={`Delete scenario “${s.name}”`} onClick={() => window.confirm(`Delete the scenario “${s.name}”?`) && remove.mutate(s.id)}>
                      <Trash2 aria-hidden className="h-4 w-4" />
                    </Button>
                  </div>
                ) : null}
              </div>
            )}
          </li>
        ))}
      </ul>
      {remove.error ? <Notice tone="error">{remove.error.message}</Notice> : null}
    </div>
  );
}

function ScenarioEditor({ cellId, changeoverId, scenario, options, onDone }: { cellId: string; changeoverId: string; scenario: ScenarioSummary; options: readonly SignalOption[]; onDone: () => void }) {
  const [name, setName] = useState(scenario.name);
  const [rules, setRules] = useState<Rule[]>(scenario.rules);
  const save = useEvidenceMutation(changeoverId, () => fetchJson(`/api/cells/${cellId}/scenarios/${scenario.id}`, { method: 'PATCH', body: { name, rules } }));
  const nextId = () => {
    let n = rules.length + 1;
    while (rules.some((r) => r.id === `r${n}`)) n++;
    return `r${n}`;
  };
  return (
    <form
      className="space-y-3"
      aria-label={`Edit scenario ${scenario.name}`}
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(undefined, { onSuccess: onDone });
      }}
    >
      <label className="block text-xs font-medium text-slate-600">
        Name
        <input value={name} onChange={(e) => setName(e.target.value)} className="mt-1 block w-full max-w-md rounded-md border border-slate-300 px-2 py-1.5 text-sm" />
      </label>
      {rules.map((r, i) => (
        <fieldset key={i} className="rounded-md border border-slate-200 p-2">
          <legend className="px-1 text-xs font-semibold text-slate-700">Rule {i + 1}</legend>
          <TraceRuleFields value={r} onChange={(next) => setRules(rules.map((x, k) => (k === i ? next : x)))} options={options} name={`Rule ${i + 1}`} />
          <Button variant="ghost" className="mt-1 px-2 py-1 text-xs" onClick={() => setRules(rules.filter((_, k) => k !== i))}>
            <Trash2 aria-hidden className="h-3 w-3" /> Remove rule {i + 1}
          </Button>
        </fieldset>
      ))}
      <Button variant="secondary" className="px-2 py-1 text-xs" onClick={() => setRules([...rules, { id: nextId(), kind: 'never', p: { signal: '', op: '==', value: 1 } }])}>
        Add a rule
      </Button>
      {save.error ? <Notice tone="error">{save.error.message}</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          Save the scenario
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
