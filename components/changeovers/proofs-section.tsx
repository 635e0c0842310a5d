'use client';
/**
 * The changeover page's proofs: the interlock rules the cell keeps (added and edited here with
 * the rule builder), and the latest verdicts of each on the base and on the proposal — proved,
 * violated (with its counterexample to open) or undecided within a bound, and how timers were
 * treated. A violation or an undecided answer on the proposal is accepted with a reason, or
 * the proposal (or the rule) is fixed and the proofs run again.
 */
import { useMemo, useState } from 'react';
import Link from 'next/link';
import { CheckCircle2, CircleHelp, CircleSlash, Pencil, Play, Plus, Trash2, XCircle } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { cn } from '@/components/ui/cn';
import { formatDateTime } from '@/lib/format';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { InterlockRuleForm } from '@/components/rules/interlock-rule-form';
import { toInterlockForm, type InterlockBody } from '@/components/rules/interlock-form-model';
import { interlockSentence } from '@/components/rules/sentences';
import { optionLabels } from '@/components/rules/signal-catalogue';
import type { ProofEvidence, VerdictSummary } from '@/lib/changeovers/evidence';
import type { StoredInterlockRule } from '@/db/interlock-rules';
import { AcceptanceBox } from './acceptance-box';
import { RunProgress } from './run-progress';
import { useBitOptions, useChangeoverDocuments, useEvidence, useEvidenceMutation } from './use-evidence';

type Props = { changeoverId: string; cellId: string; canEdit: boolean };

const STATUS = {
  proved: { Icon: CheckCircle2, words: 'proved', cls: 'text-accent-800' },
  violated: { Icon: XCircle, words: 'violated', cls: 'text-red-700' },
  undecided: { Icon: CircleHelp, words: 'undecided', cls: 'text-amber-800' },
  error: { Icon: CircleSlash, words: 'not provable', cls: 'text-slate-600' },
} as const;

const TIMER_WORDS = { exact: 'timers exact', abstracted: 'timers abstracted (sound over-approximation)', none: '' } as const;

function Verdict({ changeoverId, side, v }: { changeoverId: string; side: 'base' | 'proposal'; v: VerdictSummary | null }) {
  if (!v) return <p className="text-sm text-slate-500">{side === 'base' ? 'Base' : 'Proposal'}: not proved in this run</p>;
  const s = STATUS[v.status];
  const notes = [v.status === 'undecided' ? 'within bound' : '', TIMER_WORDS[v.timers], v.exact || v.status === 'error' ? '' : 'some blocks abstracted'].filter(Boolean);
  return (
    <div className="min-w-0 text-sm" data-testid={`verdict-${side}`}>
      <p className={cn('flex items-center gap-1.5 font-medium', s.cls)}>
        <s.Icon aria-hidden className="h-4 w-4 shrink-0" />
        <span>
          {side === 'base' ? 'Base' : 'Proposal'} (v{v.version}): <span data-testid="verdict-status">{s.words}</span>
        </span>
      </p>
      <p className="text-xs text-slate-600">{v.detail}</p>
      {notes.length ? <p className="text-xs text-slate-500">{notes.join(' · ')}</p> : null}
      {v.status === 'violated' ? (
        <Link href={`/changeovers/${changeoverId}/counterexample/${v.verdictId}`} className="mt-1 inline-flex text-xs font-medium text-accent-800 underline hover:text-accent-900">
          Open the counterexample
        </Link>
      ) : null}
    </div>
  );
}

export function ProofsSection({ changeoverId, cellId, canEdit }: Props) {
  const evidence = useEvidence(changeoverId);
  const data = evidence.data;
  const docs = useChangeoverDocuments(changeoverId, data ? { baseVersion: data.changeover.baseVersion, proposedVersion: data.changeover.proposedVersion } : undefined);
  const options = useBitOptions(docs.data);
  const labels = useMemo(() => optionLabels(options), [options]);
  const [editing, setEditing] = useState<string | 'new' | null>(null);
  const run = useEvidenceMutation(changeoverId, () => fetchJson(`/api/changeovers/${changeoverId}/proofs`, { method: 'POST' }));
  const remove = useEvidenceMutation(changeoverId, (ruleId: string) => fetchJson(`/api/cells/${cellId}/interlock-rules/${ruleId}`, { method: 'DELETE' }));
  const save = useEvidenceMutation(changeoverId, async ({ id, input }: { id: string | null; input: { title: string; rule: InterlockBody } }) => {
    try {
      await fetchJson(id ? `/api/cells/${cellId}/interlock-rules/${id}` : `/api/cells/${cellId}/interlock-rules`, { method: id ? 'PATCH' : 'POST', body: input });
    } catch (e) {
      if (e instanceof ApiClientError && e.fields) throw new Error(`${e.message} ${Object.values(e.fields).flat().join(' ')}`);
      throw e;
    }
  });

  if (evidence.isPending) return <p className="text-sm text-slate-500">Loading the proofs…</p>;
  if (evidence.isError || !data) return <Notice tone="error">The proofs could not be loaded: {evidence.error?.message}</Notice>;

  const { evidence: ev, rules } = data;
  const byRule = new Map<string, ProofEvidence>(ev.proofs.map((p) => [p.ruleId, p]));
  const gone = ev.proofs.filter((p) => !rules.some((r) => r.id === p.ruleId));
  const last = ev.runs.proofs;
  const open = ev.open.proofs;
  const stale = last && (last.baseVersion !== data.changeover.baseVersion || last.proposedVersion !== data.changeover.proposedVersion || last.inputsSha256 !== ev.current.rulesSha256);
  const sentence = (r: StoredInterlockRule) => interlockSentence({ id: r.id, title: r.title, ...r.body } as never, labels);
  const period = docs.data?.proposed.plc.sheet.scanPeriodMs;
  const locked = data.changeover.signedBy !== null || !['drafting', 'checked'].includes(data.changeover.state);

  return (
    <section aria-label="Proofs" className="space-y-4" data-testid="proofs-section">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 className="text-base font-semibold text-slate-900">Proofs</h2>
          <p className="max-w-2xl text-sm text-slate-600">
            Each interlock rule is proved over every input combination and every reachable state of the logic sheet, on the base (v{data.changeover.baseVersion}) and the proposal (v
            {data.changeover.proposedVersion}). A proof covers the modelled logic only — not the wiring, the devices or the real cell’s safety-rated circuits.
          </p>
        </div>
        {canEdit && !locked ? (
          <Button onClick={() => run.mutate(undefined)} disabled={run.isPending || Boolean(open) || rules.length === 0} data-testid="run-proofs">
            <Play aria-hidden className="h-4 w-4" /> {last ? 'Run the proofs again' : 'Run the proofs'}
          </Button>
        ) : null}
      </div>
      {run.error ? <Notice tone="error">{run.error.message}</Notice> : null}
      {ev.failed.proofs && !ev.open.proofs ? (
        <Notice tone="error">
          The last proofs job ({formatDateTime(ev.failed.proofs.createdAt)}) failed: {ev.failed.proofs.error ?? 'no reason was recorded'}. The verdicts below are from the run before it.
        </Notice>
      ) : null}
      {open ? <RunProgress changeoverId={changeoverId} run={open} what="Proofs" /> : null}
      {last ? (
        <p className="text-xs text-slate-500" data-testid="proofs-last-run">
          Last proved {formatDateTime(last.finishedAt)} by {last.requestedBy.name}, on version {last.baseVersion} → {last.proposedVersion}.
          {stale ? <span className="font-medium text-amber-800"> The rules or versions changed since: run the proofs again.</span> : null}
        </p>
      ) : rules.length > 0 ? (
        <p className="text-xs text-slate-500">The proofs have not run yet.</p>
      ) : null}

      {rules.length === 0 ? <p className="text-sm text-slate-600">The cell keeps no interlock rules yet.{canEdit ? ' Add the first one: what must stay true whatever changes.' : ''}</p> : null}
      <ol className="space-y-3">
        {rules.map((r, i) => {
          const p = byRule.get(r.id);
          return (
            <li key={r.id} className="rounded-md border border-slate-200 bg-white p-3" data-testid={`proof-rule-${i}`}>
              {editing === r.id ? (
                <InterlockRuleForm
                  options={options}
                  scanPeriodMs={period}
                  initial={toInterlockForm(r.title, r.body as InterlockBody)}
                  submitLabel="Save the rule"
                  onCancel={() => setEditing(null)}
                  onSubmit={async (input) => {
                    await save.mutateAsync({ id: r.id, input });
                    setEditing(null);
                  }}
                />
              ) : (
                <>
                  <div className="flex flex-wrap items-start justify-between gap-2">
                    <div className="min-w-0">
                      <p className="font-medium text-slate-900">{r.title}</p>
                      <p className="text-sm text-slate-700" data-testid="proof-rule-sentence">
                        {sentence(r)}
                      </p>
                    </div>
                    {canEdit ? (
                      <div className="flex gap-1">
                        <Button variant="ghost" className="px-2 py-1" aria-label={`Edit rule “${r.title}”`} onClick={() => setEditing(r.id)} disabled={!docs.data}>
                          <Pencil aria-hidden className="h-4 w-4" />
                        </Button>
                        <Button variant="ghost" className="px-2 py-1" aria-label={`Delete rule “${r.title}”`} onClick={() => window.confirm(`Delete the rule “${r.title}”?`) && remove.mutate(r.id)}>
                          <Trash2 aria-hidden className="h-4 w-4" />
                        </Button>
                      </div>
                    ) : null}
                  </div>
                  {p ? (
                    <div className="mt-2 grid gap-3 md:grid-cols-2">
                      <Verdict changeoverId={changeoverId} side="base" v={p.base} />
                      <div className="space-y-2">
                        <Verdict changeoverId={changeoverId} side="proposal" v={p.proposed} />
                        {p.proposed && (p.proposed.status === 'violated' || p.proposed.status === 'undecided') ? (
                          <AcceptanceBox changeoverId={changeoverId} target={`verdicts/${p.proposed.verdictId}`} what={`the ${p.proposed.status} rule “${r.title}”`} acceptance={p.acceptance} canEdit={canEdit && !locked} />
                        ) : null}
                      </div>
                    </div>
                  ) : (
                    <p className="mt-1 text-xs text-slate-500">Not proved yet.</p>
                  )}
                </>
              )}
            </li>
          );
        })}
      </ol>
      {gone.length > 0 ? (
        <details className="text-sm">
          <summary className="cursor-pointer text-slate-600">{gone.length} rule(s) in the last run were deleted since</summary>
          <ul className="mt-1 list-disc pl-5 text-slate-600">
            {gone.map((g) => (
              <li key={g.ruleId}>{g.title || g.sentence}</li>
            ))}
          </ul>
        </details>
      ) : null}
      {remove.error ? <Notice tone="error">{remove.error.message}</Notice> : null}

      {canEdit ? (
        editing === 'new' ? (
          <div className="rounded-md border border-accent-200 bg-white p-3">
            <h3 className="mb-2 text-sm font-semibold text-slate-900">New interlock rule</h3>
            {docs.data ? (
              <InterlockRuleForm
                options={options}
                scanPeriodMs={period}
                submitLabel="Add the rule"
                onCancel={() => setEditing(null)}
                onSubmit={async (input) => {
                  await save.mutateAsync({ id: null, input });
                  setEditing(null);
                }}
              />
            ) : (
              <p className="text-sm text-slate-500">Loading the cell’s signals…</p>
            )}
          </div>
        ) : (
          <Button variant="secondary" onClick={() => setEditing('new')} data-testid="add-interlock-rule">
            <Plus aria-hidden className="h-4 w-4" /> Add an interlock rule
          </Button>
        )
      ) : null}
    </section>
  );
}
