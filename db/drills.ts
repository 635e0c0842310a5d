import 'server-only';
import type { Knex } from 'knex';
import type { DrillInput } from './types/drills';
import { drillColumns } from './drill-columns';
import { db } from './knex';
import { isUuid } from './users';

/** A drill with everything, hidden parts included: only for its trainer, admins and the grader. */
export interface Drill extends DrillInput {
  id: string;
  trainerId: string;
  trainerName: string;
  libraryKey: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface Assignment {
  id: string;
  drillId: string;
  drillTitle: string;
  cohortId: string;
  cohortName: string;
  opensAt: string;
  closesAt: string;
  assignedBy: string;
  createdAt: string;
}

const iso = (d: Date | string) => new Date(d).toISOString();

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toDrill(r: any): Drill {
  return {
    id: r.id,
    trainerId: r.trainer_id,
    trainerName: r.trainer_name,
    title: r.title,
    cellId: r.cell_id,
    cellVersion: r.cell_version,
    brief: r.brief,
    faults: r.faults,
    objectives: r.objectives,
    rules: r.rules,
    answer: { kind: r.answer_kind, location: r.answer_location },
    diagnosisWeight: r.diagnosis_weight,
    timeLimitMs: r.time_limit_ms,
    permissions: r.permissions,
    libraryKey: r.library_key,
    createdAt: iso(r.created_at),
    updatedAt: iso(r.updated_at),
  };
}

function drillQuery(k: Knex = db()) {
  return k('drills as d').join('users as t', 't.id', 'd.trainer_id').whereNull('d.deleted_at').select('d.*', 't.name as trainer_name');
}

/** Drills a trainer owns, or every drill when trainerId is null (admins). Newest first. */
export async function listDrills(trainerId: string | null): Promise<Drill[]> {
  const q = drillQuery().orderBy('d.created_at', 'desc');
  if (trainerId) q.where('d.trainer_id', trainerId);
  return (await q).map(toDrill);
}

export async function findDrill(id: string, opts: { includeDeleted?: boolean } = {}): Promise<Drill | null> {
  if (!isUuid(id)) return null;
  const q = opts.includeDeleted
    ? db()('drills as d').join('users as t', 't.id', 'd.trainer_id').select('d.*', 't.name as trainer_name')
    : drillQuery();
  const row = await q.where('d.id', id).first();
  return row ? toDrill(row) : null;
}

export async function createDrill(trainerId: string, input: DrillInput, libraryKey: string | null = null, k: Knex = db()): Promise<Drill> {
  const [row] = await k('drills')
    .insert({ ...drillColumns(input), trainer_id: trainerId, library_key: libraryKey })
    .returning('id');
  return (await findDrillWith(k, row.id))!;
}

async function findDrillWith(k: Knex, id: string): Promise<Drill | null> {
  const row = await drillQuery(k).where('d.id', id).first();
  return row ? toDrill(row) : null;
}

/**
 * Changes a drill unless a run has started on it (its grading inputs are then frozen), in one
 * transaction: the drill row is locked FOR UPDATE, which a run's insert (its foreign key takes
 * a KEY SHARE lock on the drill) waits for, so no run can start between the check and the write.
 */
export async function updateDrillUnlessFrozen(id: string, input: DrillInput): Promise<Drill | 'frozen' | null> {
  const done = await db().transaction(async (trx) => {
    const row = await trx('drills').where({ id }).whereNull('deleted_at').forUpdate().first('id');
    if (!row) return null;
    if (await trx('runs').where({ drill_id: id }).first('id')) return 'frozen' as const;
    await trx('drills').where({ id }).update({ ...drillColumns(input), updated_at: trx.fn.now() });
    return 'updated' as const;
  });
  if (done !== 'updated') return done;
  return findDrill(id);
}

/** True once any run exists: the drill's grading inputs are then frozen so every regrade matches. */
export async function drillHasRuns(id: string): Promise<boolean> {
  return Boolean(await db()('runs').where({ drill_id: id }).first('id'));
}

/** Soft delete: runs and grades that cite the drill stay readable in the gradebook history. */
export async function deleteDrill(id: string): Promise<boolean> {
  return (await db()('drills').where({ id }).whereNull('deleted_at').update({ deleted_at: db().fn.now() })) > 0;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toAssignment(r: any): Assignment {
  return {
    id: r.id,
    drillId: r.drill_id,
    drillTitle: r.drill_title,
    cohortId: r.cohort_id,
    cohortName: r.cohort_name,
    opensAt: iso(r.opens_at),
    closesAt: iso(r.closes_at),
    assignedBy: r.assigned_by,
    createdAt: iso(r.created_at),
  };
}

function assignmentQuery() {
  return db()('assignments as a')
    .join('drills as d', 'd.id', 'a.drill_id')
    .join('cohorts as c', 'c.id', 'a.cohort_id')
    .whereNull('d.deleted_at')
    .select('a.*', 'd.title as drill_title', 'c.name as cohort_name');
}

export async function createAssignment(input: { drillId: string; cohortId: string; opensAt: string; closesAt: string; assignedBy: string }): Promise<Assignment> {
  const [row] = await db()('assignments')
    .insert({ drill_id: input.drillId, cohort_id: input.cohortId, opens_at: input.opensAt, closes_at: input.closesAt, assigned_by: input.assignedBy })
    .returning('id');
  return (await findAssignment(row.id))!;
}

export async function findAssignment(id: string): Promise<Assignment | null> {
  if (!isUuid(id)) return null;
  const row = await assignmentQuery().where('a.id', id).first();
  return row ? toAssignment(row) : null;
}

export async function listAssignmentsOfDrill(drillId: string): Promise<Assignment[]> {
  return (await assignmentQuery().where('a.drill_id', drillId).orderBy('a.opens_at', 'desc')).map(toAssignment);
}

/** Assignments of a trainer's drills (all for admins). */
export async function listAssignmentsOfTrainer(trainerId: string | null): Promise<Assignment[]> {
  const q = assignmentQuery().orderBy('a.opens_at', 'desc');
  if (trainerId) q.where('d.trainer_id', trainerId);
  return (await q).map(toAssignment);
}

export async function listAssignmentsOfCohort(cohortId: string): Promise<Assignment[]> {
  return (await assignmentQuery().where('a.cohort_id', cohortId).orderBy('a.opens_at')).map(toAssignment);
}

/** A student's assignments (through their cohorts), with their run on each if started. */
export async function listAssignmentsForStudent(userId: string): Promise<(Assignment & { runId: string | null; runStatus: string | null; timeLimitMs: number })[]> {
  const rows = await assignmentQuery()
    .join('memberships as m', 'm.cohort_id', 'a.cohort_id')
    .leftJoin('runs as r', function () {
      this.on('r.assignment_id', 'a.id').andOn('r.user_id', 'm.user_id');
    })
    .where('m.user_id', userId)
    .select('r.id as run_id', 'r.status as run_status', 'd.time_limit_ms')
    .orderBy('a.closes_at');
  return rows.map((r) => ({ ...toAssignment(r), runId: r.run_id ?? null, runStatus: r.run_status ?? null, timeLimitMs: r.time_limit_ms }));
}

export async function isCohortMember(cohortId: string, userId: string): Promise<boolean> {
  return Boolean(await db()('memberships').where({ cohort_id: cohortId, user_id: userId }).first('user_id'));
}

/** Students of a cohort, for the assignment e-mail and the gradebook rows. */
export async function cohortStudents(cohortId: string): Promise<{ id: string; name: string; email: string }[]> {
  return db()('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where('m.cohort_id', cohortId)
    .where('u.role', 'student')
    .where('u.disabled', false)
    .select('u.id', 'u.name', 'u.email')
    .orderBy('u.name');
}

/** True when the drill is assigned to a cohort the user belongs to and that assignment has opened (its brief is theirs to read). */
export async function isDrillOpenedToMember(drillId: string, userId: string): Promise<boolean> {
  const row = await db()('assignments as a')
    .join('memberships as m', 'm.cohort_id', 'a.cohort_id')
    .where({ 'a.drill_id': drillId, 'm.user_id': userId })
    .where('a.opens_at', '<=', db().fn.now())
    .first('a.id');
  return Boolean(row);
}

/**
 * True while the user could still attempt the drill: an assignment of it to one of their
 * cohorts has not closed yet (open now, or still to open), that is, closes at or after
 * `notClosedSince` (the window rule's instant, lib/drills/assignment-window.ts). Its hidden
 * parts stay hidden then.
 */
export async function hasUnclosedAssignmentFor(drillId: string, userId: string, notClosedSince: Date): Promise<boolean> {
  const row = await db()('assignments as a')
    .join('memberships as m', 'm.cohort_id', 'a.cohort_id')
    .where({ 'a.drill_id': drillId, 'm.user_id': userId })
    .where('a.closes_at', '>=', notClosedSince)
    .first('a.id');
  return Boolean(row);
}
