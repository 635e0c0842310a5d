import 'server-only';
import Papa from 'papaparse';
import { ApiError } from '@/lib/api/errors';
import { csvSafeCell } from '@/lib/csv-cell';
import { assignmentState } from '@/lib/drills/assignment-window';
import type { Assignment, Drill } from '@/db/drills';
import { cohortStudents } from '@/db/drills';
import { listRunsOfAssignments } from '@/db/runs';
import { listBatchesOfRuns } from '@/db/live';
import { faultFound } from './board';
import { emptyFacts, foldEvents } from './fold';

/** What the cohort found on one assignment, once it has closed: the figures behind its charts. */
export interface Findings {
  assignmentId: string;
  drillTitle: string;
  students: number;
  submitted: number;
  /** Per hidden fault card: students (of those who submitted) who found it and who missed it. */
  faults: { id: string; label: string; found: number; missed: number }[];
  /** Cell time to a correct diagnosis (kind and place), in minutes, bucketed; with the median. */
  diagnosis: { correct: number; medianMs: number | null; buckets: { label: string; count: number }[] };
  /** Grades that count (overrides included), in tens. */
  grades: { label: string; count: number }[];
  /** Grading rules by how many submitted runs failed them, most failed first. */
  rules: { id: string; label: string; failed: number; inconclusive: number; passed: number }[];
}

const GRADE_BUCKETS = Array.from({ length: 10 }, (_, i) => ({ lo: i * 10, hi: i === 9 ? 100.0001 : i * 10 + 10, label: i === 9 ? '90–100' : `${i * 10}–${i * 10 + 9}` }));
const TIME_BUCKETS_MIN = [2, 5, 10, 20, 30, 60];

function timeBuckets(ms: number[]): { label: string; count: number }[] {
  const out = TIME_BUCKETS_MIN.map((m, i) => ({ label: `${i === 0 ? 0 : TIME_BUCKETS_MIN[i - 1]}–${m} min`, count: 0 }));
  out.push({ label: `over ${TIME_BUCKETS_MIN.at(-1)} min`, count: 0 });
  for (const v of ms) {
    const i = TIME_BUCKETS_MIN.findIndex((m) => v < m * 60_000);
    out[i < 0 ? out.length - 1 : i].count += 1;
  }
  return out;
}

/** The findings of a closed assignment; 409 while it is still open or to come: the figures would change under the trainer. */
export async function findingsOfClosed(assignment: Assignment, drill: Drill): Promise<Findings> {
  if (assignmentState(assignment) !== 'closed') throw new ApiError(409, 'The findings open when the assignment closes.');
  return buildFindings(assignment, drill);
}

export async function buildFindings(assignment: Assignment, drill: Drill): Promise<Findings> {
  const [students, runs] = await Promise.all([cohortStudents(assignment.cohortId), listRunsOfAssignments([assignment.id])]);
  const submitted = runs.filter((r) => r.status === 'submitted');
  const batches = await listBatchesOfRuns(submitted.map((r) => r.id));
  const cleared = new Map<string, string[]>();
  for (const b of batches) {
    const prev = { ...emptyFacts(), cleared: cleared.get(b.runId) ?? [] };
    cleared.set(b.runId, foldEvents(prev, b.events, new Set()).facts.cleared);
  }
  const faults = drill.faults.map((c) => {
    const found = submitted.filter((r) => faultFound(c, cleared.get(r.id) ?? [], r.diagnosis)).length;
    return { id: c.id, label: c.label ?? c.kind, found, missed: submitted.length - found };
  });
  const times = submitted
    .filter((r) => r.breakdown?.diagnosis.kindCorrect && r.breakdown.diagnosis.locationCorrect)
    .map((r) => r.endedMs ?? r.breakdown?.endedMs ?? 0)
    .sort((a, b) => a - b);
  const grades = GRADE_BUCKETS.map((b) => ({ label: b.label, count: 0 }));
  for (const r of submitted) {
    const g = r.overrideGrade ?? r.grade;
    if (g === null) continue;
    const i = GRADE_BUCKETS.findIndex((b) => g >= b.lo && g < b.hi);
    if (i >= 0) grades[i].count += 1;
  }
  const rules = new Map<string, { id: string; label: string; failed: number; inconclusive: number; passed: number }>();
  for (const w of drill.rules) rules.set(w.rule.id, { id: w.rule.id, label: w.rule.id, failed: 0, inconclusive: 0, passed: 0 });
  for (const r of submitted) {
    for (const s of r.breakdown?.rules ?? []) {
      const row = rules.get(s.id) ?? rules.set(s.id, { id: s.id, label: s.label ?? s.id, failed: 0, inconclusive: 0, passed: 0 }).get(s.id)!;
      if (s.label) row.label = s.label;
      if (s.status === 'fail') row.failed += 1;
      else if (s.status === 'inconclusive') row.inconclusive += 1;
      else row.passed += 1;
    }
  }
  return {
    assignmentId: assignment.id,
    drillTitle: drill.title,
    students: students.length,
    submitted: submitted.length,
    faults,
    diagnosis: { correct: times.length, medianMs: times.length ? times[Math.floor((times.length - 1) / 2)] : null, buckets: timeBuckets(times) },
    grades,
    rules: [...rules.values()].sort((a, b) => b.failed - a.failed || b.inconclusive - a.inconclusive || a.id.localeCompare(b.id)),
  };
}

/** The findings as CSV, one table of `section, item, figure, value` rows, every text cell neutralised. */
export function findingsCsv(f: Findings): string {
  const s = csvSafeCell;
  const rows: string[][] = [['Section', 'Item', 'Figure', 'Value']];
  rows.push([s('Drill'), s(f.drillTitle), 'students', String(f.students)], [s('Drill'), s(f.drillTitle), 'submitted', String(f.submitted)]);
  for (const x of f.faults) rows.push(['Fault card', s(`${x.label} (${x.id})`), 'found', String(x.found)], ['Fault card', s(`${x.label} (${x.id})`), 'missed', String(x.missed)]);
  rows.push(['Diagnosis', 'correct', 'runs', String(f.diagnosis.correct)], ['Diagnosis', 'median time', 'ms', f.diagnosis.medianMs === null ? '' : String(f.diagnosis.medianMs)]);
  for (const b of f.diagnosis.buckets) rows.push(['Time to diagnosis', s(b.label), 'runs', String(b.count)]);
  for (const g of f.grades) rows.push(['Grade', s(g.label), 'runs', String(g.count)]);
  for (const r of f.rules) rows.push(['Rule', s(r.label), 'failed', String(r.failed)], ['Rule', s(r.label), 'inconclusive', String(r.inconclusive)], ['Rule', s(r.label), 'passed', String(r.passed)]);
  return Papa.unparse(rows);
}
