import type { DiffArea } from '@/simulator';
import type { CheckEvidence, ProofEvidence, VerdictSummary } from './evidence';
import type { OutcomeChange, ScenarioOutcome } from './scenario-check';

/**
 * The signed record's evidence in words, one way for the record page
 * (components/changeovers/signed-record.tsx) and the printed report (lib/reports/changeover-report.ts).
 */

/** Each diff area's title, in the order of the engine's DIFF_AREAS: the changeover page, the record and the printed report. */
export const AREA_TITLES: Record<DiffArea, string> = {
  cell: 'Cell settings',
  devices: 'Panel and field devices',
  modules: 'Modules',
  wiring: 'Wiring (terminal strip)',
  pointMap: 'Controller point map',
  logic: 'Logic sheet',
  routine: 'Robot routine',
  handshake: 'Handshake roles',
};

/** The evidence part of a signed record, as sign-off wrote it. */
export type RecordEvidence = { ranOn: { baseVersion: number; proposedVersion: number } | null; proofs: ProofEvidence[]; checks: CheckEvidence[] };

const VERDICT_WORDS = { proved: 'proved', violated: 'VIOLATED', undecided: 'undecided', error: 'not provable' } as const;

/** A verdict and the version it was proved on; `withDetail` adds the prover's words on a second line. */
export function verdictText(v: VerdictSummary | null, withDetail = false): string {
  if (!v) return 'not proved';
  const head = `${VERDICT_WORDS[v.status]} (v${v.version})`;
  return withDetail ? `${head}\n${v.detail}` : head;
}

/** A scenario's outcome: how many of its rules passed and failed, and how long it ran. */
export function outcomeText(o: ScenarioOutcome): string {
  if (o.problems.length > 0) return `could not run: ${o.problems[0]}`;
  const pass = o.rules.filter((r) => r.status === 'pass').length;
  const fail = o.rules.filter((r) => r.status === 'fail').length;
  const other = o.rules.length - pass - fail;
  return `${pass} pass, ${fail} fail${other ? `, ${other} other` : ''} · ${o.endMs} ms`;
}

/** One changed outcome; `arrow` joins a rule's before and after (the printed report's font has no arrow). */
export function changeText(c: OutcomeChange, arrow = '→'): string {
  if (c.kind === 'rule') return `rule ${c.label ?? c.rule}: ${c.from} ${arrow} ${c.to}`;
  if (c.kind === 'trace') return 'the compared signals’ trace differs';
  return `${c.side} could not run it: ${c.message}`;
}
