import 'server-only';
import type { LoggedEvent } from '@/simulator';
import type { BoardMessage, StudentMessage } from './types/live';
import { db } from './knex';
import { isUuid } from './users';

/** The live board's data: stored batches by run, and trainers' messages (table run_messages). */

export interface BatchEvents {
  runId: string;
  seq: number;
  untilMs: number;
  events: LoggedEvent[];
  createdAt: string;
}

const iso = (d: Date | string) => new Date(d).toISOString();

/** Every batch of the given runs, in sequence order per run (the board's first picture). */
export async function listBatchesOfRuns(runIds: string[]): Promise<BatchEvents[]> {
  if (runIds.length === 0) return [];
  const rows = await db()('run_batches').whereIn('run_id', runIds).orderBy(['run_id', 'seq']).select('run_id', 'seq', 'until_ms', 'events', 'created_at');
  return rows.map((r) => ({ runId: r.run_id, seq: r.seq, untilMs: Number(r.until_ms), events: r.events, createdAt: iso(r.created_at) }));
}

/** Batches of one run after `afterSeq` (a notice names the newest; any missed between come too). */
export async function batchesAfter(runId: string, afterSeq: number): Promise<BatchEvents[]> {
  if (!isUuid(runId)) return [];
  const rows = await db()('run_batches').where({ run_id: runId }).where('seq', '>', afterSeq).orderBy('seq').select('run_id', 'seq', 'until_ms', 'events', 'created_at');
  return rows.map((r) => ({ runId: r.run_id, seq: r.seq, untilMs: Number(r.until_ms), events: r.events, createdAt: iso(r.created_at) }));
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toBoardMessage(r: any): BoardMessage {
  return { id: r.id, kind: r.kind, body: r.body, toUserId: r.user_id, toName: r.to_name ?? null, authorName: r.author_name, createdAt: iso(r.created_at) };
}

function messageQuery() {
  return db()('run_messages as m')
    .join('users as a', 'a.id', 'm.author_id')
    .leftJoin('users as s', 's.id', 'm.user_id')
    .select('m.*', 'a.name as author_name', 's.name as to_name');
}

export async function insertRunMessage(input: { assignmentId: string; userId: string | null; authorId: string; kind: 'hint' | 'message'; body: string }): Promise<BoardMessage> {
  const [row] = await db()('run_messages')
    .insert({ assignment_id: input.assignmentId, user_id: input.userId, author_id: input.authorId, kind: input.kind, body: input.body })
    .returning('id');
  return toBoardMessage(await messageQuery().where('m.id', row.id).first());
}

/** Every message of an assignment, oldest first (the trainer's board). */
export async function listMessagesOfAssignment(assignmentId: string): Promise<BoardMessage[]> {
  return (await messageQuery().where('m.assignment_id', assignmentId).orderBy('m.created_at')).map(toBoardMessage);
}

export async function findRunMessage(id: string): Promise<BoardMessage | null> {
  if (!isUuid(id)) return null;
  const row = await messageQuery().where('m.id', id).first();
  return row ? toBoardMessage(row) : null;
}

/** What one student of the assignment was sent: to them, or to everyone. */
export async function listMessagesForStudent(assignmentId: string, userId: string): Promise<StudentMessage[]> {
  const rows = await messageQuery()
    .where('m.assignment_id', assignmentId)
    .where((q) => q.where('m.user_id', userId).orWhereNull('m.user_id'))
    .orderBy('m.created_at');
  return rows.map((r) => ({ id: r.id, kind: r.kind, body: r.body, authorName: r.author_name, createdAt: iso(r.created_at) }));
}
