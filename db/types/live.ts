/** Stored run messages as db/live.ts returns them (the live board, a student's message stream). See db/types/users.ts for why here. */

export interface BoardMessage {
  id: string;
  kind: 'hint' | 'message';
  body: string;
  /** null: to everyone of the assignment. */
  toUserId: string | null;
  toName: string | null;
  authorName: string;
  createdAt: string;
}

/** What a student receives of a message: never who else got it. */
export interface StudentMessage {
  id: string;
  kind: 'hint' | 'message';
  body: string;
  authorName: string;
  createdAt: string;
}
