import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { env } from '@/lib/env';
import { userFromRequest } from '@/lib/auth/session';
import { assignmentState } from '@/lib/drills/access';
import { locationKey } from '@/lib/runs/grade';
import { may } from '@/lib/roles';
import { peekLive } from '@/lib/runs/engine-host';
import type { User } from '@/db/users';
import { cohortStudents, findAssignment, findDrill, type Assignment, type Drill } from '@/db/drills';
import { findRun, listRunsOfAssignments, type Run } from '@/db/runs';
import { getVersion } from '@/db/cells';
import { batchesAfter, findRunMessage, listBatchesOfRuns, listMessagesOfAssignment, type BatchEvents } from '@/db/live';
import type { CellSnapshot } from '@/simulator';
import { emptyFacts, faultPlaces, foldEvents, type EventFacts } from './fold';
import { subscribeLive } from './listener';
import { sseResponse, type SseChannel } from './sse';
import type { Board, BoardTile, NotableEvent } from './types';

/** Entries the drill-wide timeline keeps (newest last). */
const TIMELINE_LIMIT = 200;

/** An assignment the user may watch: its drill's trainer, or an admin; 404 for anyone else (ids reveal nothing). */
export async function assignmentForWatcher(user: User, id: string): Promise<{ assignment: Assignment; drill: Drill }> {
  const assignment = await findAssignment(id);
  const drill = assignment ? await findDrill(assignment.drillId) : null;
  if (!assignment || !drill || (user.role !== 'admin' && drill.trainerId !== user.id)) throw new ApiError(404, 'No such assignment.');
  return { assignment, drill };
}

/** True while the user may still watch (the stream's minute re-check). */
async function mayWatch(req: Request, id: string): Promise<boolean> {
  const user = await userFromRequest(req);
  if (!user || !may(user.role, 'drills')) return false;
  return assignmentForWatcher(user, id).then(
    () => true,
    () => false,
  );
}

/** A hidden fault card counts as found when the student cleared it, or named its kind and place in the diagnosis. */
export function faultFound(card: Drill['faults'][number], cleared: readonly string[], diagnosis: Run['diagnosis']): boolean {
  if (cleared.includes(card.id)) return true;
  if (!diagnosis || diagnosis.kind !== card.kind) return false;
  const given = new Set(locationKey(diagnosis.location).split(','));
  return faultPlaces(card).some((p) => given.has(p));
}

function cellInSmall(s: CellSnapshot): BoardTile['cell'] {
  return {
    controller: s.controller.state,
    detail: s.controller.detail,
    arm: { moving: s.arm.moving, target: s.arm.target },
    handshake: { ...s.controller.handshake },
  };
}

/**
 * The run's cell in small, read from the engine thread that already holds it for the student's
 * batches (a `peek`: a snapshot of the cached cell, no simulation, off this event loop), or null
 * when no thread of this process holds it — the tile then shows the facts from the events only.
 * Replaying the log here instead would cost a whole-log simulation per batch per watcher; with 30
 * students streaming that is the load the design keeps off the app process.
 */
async function peekCell(runId: string): Promise<BoardTile['cell']> {
  try {
    const hit = await peekLive(runId);
    return hit ? cellInSmall(hit.snapshot) : null;
  } catch {
    return null;
  }
}

/** What a board holds per run to fold new batches into. */
interface RunFold {
  run: Run;
  facts: EventFacts;
  lastSeq: number;
  untilMs: number;
}

/** The board's working state: the picture, and per run the facts to fold new batches into. */
export interface BoardState {
  board: Board;
  folds: Map<string, RunFold>;
  estops: Set<string>;
  drill: Drill;
}

function tileOf(state: BoardState, student: { id: string; name: string }, f: RunFold | undefined, cell: BoardTile['cell']): BoardTile {
  const { drill } = state;
  const run = f?.run ?? null;
  const facts = f?.facts ?? emptyFacts();
  const deadline = run ? new Date(Math.min(Date.parse(run.startedAt) + drill.timeLimitMs, Date.parse(state.board.assignment.closesAt))).toISOString() : null;
  return {
    studentId: student.id,
    name: student.name,
    status: !run ? 'not-started' : run.status === 'submitted' ? 'submitted' : 'running',
    runId: run?.id ?? null,
    startedAt: run?.startedAt ?? null,
    deadline,
    untilMs: f?.untilMs ?? 0,
    lastSeq: f?.lastSeq ?? 0,
    grade: run ? (run.overrideGrade ?? run.grade) : null,
    forces: facts.forces,
    estopPressed: facts.estopPressed,
    faults: drill.faults.map((c) => ({ id: c.id, label: c.label ?? c.kind, found: faultFound(c, facts.cleared, run?.diagnosis ?? null) })),
    cell,
    lastEvent: facts.lastEvent,
  };
}

function fold(state: BoardState, f: RunFold, batches: BatchEvents[]): NotableEvent[] {
  const out: NotableEvent[] = [];
  for (const b of batches) {
    if (b.seq <= f.lastSeq) continue;
    const r = foldEvents(f.facts, b.events, state.estops);
    f.facts = r.facts;
    f.lastSeq = b.seq;
    f.untilMs = Math.max(f.untilMs, b.untilMs);
    for (const n of r.notable) out.push({ runId: f.run.id, studentName: f.run.userName, t: n.t, at: b.createdAt, text: n.text });
  }
  const tl = state.board.timeline;
  tl.push(...out);
  if (tl.length > TIMELINE_LIMIT) tl.splice(0, tl.length - TIMELINE_LIMIT);
  return out;
}

/** The board of an assignment as it stands: one tile per student of the cohort, the timeline, the messages. */
export async function loadBoard(assignment: Assignment, drill: Drill): Promise<BoardState> {
  const [students, runs, version, messages] = await Promise.all([
    cohortStudents(assignment.cohortId),
    listRunsOfAssignments([assignment.id]),
    getVersion(drill.cellId, drill.cellVersion),
    listMessagesOfAssignment(assignment.id),
  ]);
  const estops = new Set((version?.document.panel ?? []).filter((d) => d.type === 'e-stop').map((d) => d.id));
  const state: BoardState = {
    drill,
    estops,
    folds: new Map(),
    board: {
      assignment: { id: assignment.id, drillId: drill.id, drillTitle: drill.title, cohortName: assignment.cohortName, opensAt: assignment.opensAt, closesAt: assignment.closesAt, state: assignmentState(assignment), timeLimitMs: drill.timeLimitMs },
      tiles: [],
      timeline: [],
      messages,
    },
  };
  const batches = await listBatchesOfRuns(runs.map((r) => r.id));
  const byRun = new Map<string, BatchEvents[]>();
  for (const b of batches) (byRun.get(b.runId) ?? byRun.set(b.runId, []).get(b.runId)!).push(b);
  for (const run of runs) {
    const f: RunFold = { run, facts: emptyFacts(), lastSeq: 0, untilMs: 0 };
    state.folds.set(run.id, f);
    fold(state, f, byRun.get(run.id) ?? []);
  }
  state.board.timeline.sort((a, b) => a.at.localeCompare(b.at) || a.t - b.t);
  const byUser = new Map(runs.map((r) => [r.userId, r]));
  state.board.tiles = await Promise.all(
    students.map(async (s) => {
      const run = byUser.get(s.id);
      const f = run ? state.folds.get(run.id) : undefined;
      return tileOf(state, s, f, run && run.status === 'active' ? await peekCell(run.id) : null);
    }),
  );
  return state;
}

/**
 * The live board as Server-Sent Events: `board` (the whole picture, first and after the
 * LISTEN connection was replaced), then `tile` (one student's tile, after each batch or status
 * change), `timeline` (the notable events of that batch) and `message` (a message posted by
 * any trainer of the assignment, from any process). Notices are handled one at a time per
 * stream, so a run's batches fold in order.
 */
export function boardStream(req: Request, assignment: Assignment, drill: Drill): Response {
  return sseResponse(
    req,
    async (ch: SseChannel) => {
      let state: BoardState | null = null;
      let queue: Promise<void> = Promise.resolve();
      const enqueue = (work: () => Promise<void>) => {
        queue = queue.then(work).catch((err) => {
          console.error('[live] board update failed', err);
        });
      };
      const resync = async () => {
        state = await loadBoard(assignment, drill);
        ch.send('board', state.board);
      };
      const unsubscribe = await subscribeLive(env().DATABASE_URL, {
        onNotice(n) {
          if (n.assignmentId !== assignment.id) return;
          enqueue(async () => {
            if (!state || ch.closed) return;
            const s: BoardState = state;
            if (n.kind === 'message') {
              const m = await findRunMessage(n.messageId);
              if (m) {
                s.board.messages.push(m);
                ch.send('message', m);
              }
              return;
            }
            let f = s.folds.get(n.runId);
            if (!f || n.kind === 'run') {
              const run = await findRun(n.runId);
              if (!run) return;
              if (!f) s.folds.set(run.id, (f = { run, facts: emptyFacts(), lastSeq: 0, untilMs: 0 }));
              else f.run = run;
            }
            const notable = n.kind === 'batch' ? fold(s, f, await batchesAfter(n.runId, f.lastSeq)) : [];
            const idx = s.board.tiles.findIndex((t) => t.studentId === f.run.userId);
            if (idx < 0) return; // not (or no longer) a student of the cohort
            const cell = f.run.status === 'active' ? await peekCell(f.run.id) : null;
            const tile = tileOf(s, { id: f.run.userId, name: s.board.tiles[idx].name }, f, cell ?? s.board.tiles[idx].cell);
            s.board.tiles[idx] = tile;
            ch.send('tile', tile);
            if (notable.length) ch.send('timeline', notable);
          });
        },
        onResync() {
          enqueue(resync);
        },
      });
      enqueue(resync);
      await queue;
      return unsubscribe;
    },
    () => mayWatch(req, assignment.id),
  );
}
