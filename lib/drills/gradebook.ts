import 'server-only';
import Papa from 'papaparse';
import { csvSafeCell } from '@/lib/csv-cell';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findCohort, type CohortSummary } from '@/db/cohorts';
import { cohortStudents, listAssignmentsOfCohort } from '@/db/drills';
import { listRunsOfAssignments } from '@/db/runs';
import { assignmentState } from './access';

export interface GradebookCell {
  runId: string;
  status: 'active' | 'submitted';
  /** The grade that counts: the override when there is one, else the computed grade. */
  grade: number | null;
  computedGrade: number | null;
  overridden: boolean;
  overrideReason: string | null;
  submittedAt: string | null;
  diagnosis: { kind: string; location: string } | null;
}

export interface Gradebook {
  cohort: { id: string; name: string };
  columns: { assignmentId: string; drillId: string; drillTitle: string; opensAt: string; closesAt: string; state: string }[];
  rows: { studentId: string; name: string; email: string; cells: Record<string, GradebookCell | null> }[];
}

/** The cohort a gradebook is for: its trainer's own, any for an admin; 404 otherwise (ids reveal nothing). */
export async function cohortForGradebook(user: User, cohortId: string): Promise<CohortSummary> {
  const cohort = await findCohort(cohortId);
  if (!cohort || (user.role !== 'admin' && cohort.trainerId !== user.id)) throw new ApiError(404, 'No such cohort.');
  return cohort;
}

/** Cohort × drill: one row per student, one column per assignment, each cell the student's run. */
export async function buildGradebook(cohort: CohortSummary): Promise<Gradebook> {
  const assignments = await listAssignmentsOfCohort(cohort.id);
  const students = await cohortStudents(cohort.id);
  const runs = await listRunsOfAssignments(assignments.map((a) => a.id));
  const byKey = new Map(runs.map((r) => [`${r.assignmentId}|${r.userId}`, r]));
  return {
    cohort: { id: cohort.id, name: cohort.name },
    columns: assignments.map((a) => ({ assignmentId: a.id, drillId: a.drillId, drillTitle: a.drillTitle, opensAt: a.opensAt, closesAt: a.closesAt, state: assignmentState(a) })),
    rows: students.map((s) => ({
      studentId: s.id,
      name: s.name,
      email: s.email,
      cells: Object.fromEntries(
        assignments.map((a) => {
          const r = byKey.get(`${a.id}|${s.id}`);
          const cell: GradebookCell | null = r
            ? {
                runId: r.id,
                status: r.status,
                grade: r.overrideGrade ?? r.grade,
                computedGrade: r.grade,
                overridden: r.overrideGrade !== null,
                overrideReason: r.overrideReason,
                submittedAt: r.submittedAt,
                diagnosis: r.diagnosis ? { kind: r.diagnosis.kind, location: r.diagnosis.location } : null,
              }
            : null;
          return [a.id, cell];
        }),
      ),
    })),
  };
}

/**
 * The gradebook as CSV (papaparse): one row per student, one column per drill with the grade
 * that counts; empty when not submitted. A formula-looking cell is prefixed with a quote so a
 * spreadsheet shows it as text (OWASP "CSV injection", common practice).
 */
export function gradebookCsv(book: Gradebook): string {
  const safe = csvSafeCell;
  const header = ['Student', 'E-mail', ...book.columns.map((c) => safe(`${c.drillTitle} (closes ${c.closesAt.slice(0, 10)})`))];
  const rows = book.rows.map((r) => [
    safe(r.name),
    safe(r.email),
    ...book.columns.map((c) => {
      const cell = r.cells[c.assignmentId];
      return cell && cell.status === 'submitted' && cell.grade !== null ? String(cell.grade) : '';
    }),
  ]);
  return Papa.unparse([header, ...rows]);
}
