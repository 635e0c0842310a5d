/**
 * Shared set-up for the drills and runs integration tests: a trainer's cell, a drill on it,
 * a cohort with fresh students, and an assignment — made through the data modules, so each
 * test file starts from its own people and never depends on another file's state.
 */
import { db } from '@/db/knex';
import { createCell } from '@/db/cells';
import { createCohort } from '@/db/cohorts';
import { createAssignment, createDrill, type Drill } from '@/db/drills';
import type { User } from '@/db/users';
import { drillInputSchema } from '@/lib/schemas/drills';
import { cellDocumentSchema, pickAndPlaceCell, type FaultCard } from '@/simulator';
import { makeUser, uniqueEmail } from './helpers';

/** Hidden faults whose ids and labels are easy to search for in a JSON text. */
export const HIDDEN_FAULTS: FaultCard[] = [
  { id: 'hiddenStopBreak', kind: 'open-wire', row: 'w-stop', at: 3000, label: 'HIDDEN-LABEL-STOP' },
  { id: 'hiddenPartMismatch', kind: 'sensor-type-mismatch', device: 'part', label: 'HIDDEN-LABEL-PART' },
];

export function drillBody(cellId: string, extra: Record<string, unknown> = {}) {
  return {
    title: 'Integration drill',
    cellId,
    cellVersion: 1,
    brief: 'Find the fault.',
    faults: HIDDEN_FAULTS,
    objectives: ['Find it.'],
    rules: [
      { weight: 4, rule: { id: 'hiddenRuleCycle', kind: 'eventually', withinMs: 60_000, p: { signal: 'ctl.cycles', op: '>=', value: 1 } } },
      { weight: 6, rule: { id: 'hiddenRuleFault', kind: 'never', p: { signal: 'fault.hiddenStopBreak', op: '==', value: 1 } } },
    ],
    answer: { kind: 'open-wire', location: 'w-stop' },
    diagnosisWeight: 10,
    timeLimitMs: 600_000,
    permissions: { forceAllowed: false, editable: [] },
    ...extra,
  };
}

export interface DrillWorld {
  trainer: User;
  cellId: string;
  drill: Drill;
  cohortId: string;
  students: User[];
  assignmentId: string;
}

/** A trainer's own cell, a drill with hidden faults, a cohort of `n` students, and an open assignment. */
export async function drillWorld(trainer: User, n = 2, window: { opensAt?: Date; closesAt?: Date } = {}): Promise<DrillWorld> {
  const cell = await createCell({ ownerId: trainer.id, name: 'Drill base', origin: 'template', document: cellDocumentSchema.parse(pickAndPlaceCell), message: 'test' });
  const drill = await createDrill(trainer.id, drillInputSchema.parse(drillBody(cell.id)));
  const cohort = await createCohort(trainer.id, { name: `Drill cohort ${uniqueEmail('c')}`, description: '' });
  if (!cohort.ok) throw new Error('cohort');
  const students: User[] = [];
  for (let i = 0; i < n; i++) {
    const s = await makeUser('student');
    await db()('memberships').insert({ cohort_id: cohort.cohort.id, user_id: s.id });
    students.push(s);
  }
  const a = await createAssignment({
    drillId: drill.id,
    cohortId: cohort.cohort.id,
    opensAt: (window.opensAt ?? new Date(Date.now() - 3_600_000)).toISOString(),
    closesAt: (window.closesAt ?? new Date(Date.now() + 86_400_000)).toISOString(),
    assignedBy: trainer.id,
  });
  return { trainer, cellId: cell.id, drill, cohortId: cohort.cohort.id, students, assignmentId: a.id };
}

/** Text that must never appear in what a student receives before the drill closes. */
export const SECRET_NEEDLES = ['hiddenStopBreak', 'hiddenPartMismatch', 'HIDDEN-LABEL-STOP', 'HIDDEN-LABEL-PART', 'sensor-type-mismatch', 'open-wire', 'hiddenRuleCycle', 'hiddenRuleFault'];

export function expectNoSecrets(value: unknown, expectFn: (text: string, needle: string) => void): void {
  const text = JSON.stringify(value);
  for (const needle of SECRET_NEEDLES) expectFn(text, needle);
}
