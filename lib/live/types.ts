/** Shared with the browser: what the live board and a student's message stream carry. */
import type { BoardMessage } from '@/db/types/live';

// The stored message shapes live below db/ and lib/ (db/types/live.ts).
export type { BoardMessage, StudentMessage } from '@/db/types/live';

export const LIVE_CHANNEL = 'cellwright_live';

/** A NOTIFY from the live triggers (db/migrations/20261204_601_live_board.ts). */
export type LiveNotice =
  | { kind: 'batch'; assignmentId: string; runId: string; userId: string; seq: number; untilMs: number }
  | { kind: 'run'; assignmentId: string; runId: string; userId: string; status: string }
  | { kind: 'message'; assignmentId: string; messageId: string; userId: string | null };

export type TileStatus = 'not-started' | 'running' | 'submitted';

/** One notable event of a run, for a tile's last line and the drill-wide timeline. */
export interface NotableEvent {
  runId: string;
  studentName: string;
  /** Cell time of the run (ms). */
  t: number;
  /** When the batch that carried it was stored (ISO). */
  at: string;
  text: string;
}

/** A student's tile: the run's facts from its stored log, and its cell in small when a server thread holds it. */
export interface BoardTile {
  studentId: string;
  name: string;
  status: TileStatus;
  runId: string | null;
  startedAt: string | null;
  /** When the attempt's time runs out (started + the drill's time limit), or null before it starts. */
  deadline: string | null;
  untilMs: number;
  lastSeq: number;
  grade: number | null;
  forces: Record<string, number>;
  estopPressed: string[];
  faults: { id: string; label: string; found: boolean }[];
  cell: {
    controller: string;
    detail: string | null;
    arm: { moving: boolean; target: string | null };
    handshake: Record<string, boolean>;
  } | null;
  lastEvent: string | null;
}

export interface Board {
  assignment: { id: string; drillId: string; drillTitle: string; cohortName: string; opensAt: string; closesAt: string; state: 'upcoming' | 'open' | 'closed'; timeLimitMs: number };
  tiles: BoardTile[];
  timeline: NotableEvent[];
  messages: BoardMessage[];
}

