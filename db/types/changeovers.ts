import type { Role } from './users';

/** Changeover shapes as db/changeovers.ts returns them and the routes answer them (dates as ISO strings). See db/types/users.ts for why here. */
export const CHANGEOVER_STATES = ['drafting', 'checked', 'signed-off', 'rolled-back', 'withdrawn'] as const;
export type ChangeoverState = (typeof CHANGEOVER_STATES)[number];

export interface PersonRef {
  id: string;
  name: string;
}

export interface Changeover {
  id: string;
  cellId: string;
  cellName: string;
  cellOwnerId: string;
  /** False once the cell has been deleted (soft): the changeover and its record stay readable. */
  cellActive: boolean;
  title: string;
  description: string;
  openedBy: PersonRef;
  baseVersion: number;
  /** The pinned proposal; null while drafting (the proposal is the cell's latest version). */
  pinnedVersion: number | null;
  pinnedAt: string | null;
  /** The cell's latest version now. */
  latestVersion: number;
  /** What the proposal is right now: the pinned version, or the latest while drafting. */
  proposedVersion: number;
  state: ChangeoverState;
  countersigner: PersonRef | null;
  /** The opener's signature, waiting for (or, once signed off, joined by) a countersignature. */
  signedBy: PersonRef | null;
  signedAt: string | null;
  rolledBackBy: PersonRef | null;
  rolledBackAt: string | null;
  rollbackVersion: number | null;
  createdAt: string;
  updatedAt: string;
}

export type ChangeoverEventKind =
  | 'opened'
  | 'edited'
  | 'countersigner'
  | 'pinned'
  | 'unpinned'
  | 'signed'
  | 'signature-withdrawn'
  | 'countersigned'
  | 'rolled-back'
  | 'withdrawn';

export interface ChangeoverEvent {
  id: string;
  kind: ChangeoverEventKind;
  actor: PersonRef;
  detail: Record<string, unknown>;
  createdAt: string;
}

/** The content of a signed record, as lib/changeovers/sign-off.ts assembles it. */
export interface RecordContent {
  cellName: string;
  title: string;
  description: string;
  baseVersion: number;
  proposedVersion: number;
  baseSha256: string;
  proposedSha256: string;
  diffSummary: unknown;
  evidence: unknown;
}

export interface SignedRecord extends RecordContent {
  changeoverId: string;
  cellId: string;
  signedBy: PersonRef;
  signedAt: string;
  countersignedBy: PersonRef & { role: Role };
  countersignedAt: string;
  createdAt: string;
}

/** What the page may offer the signed-in person (the routes check again). */
export interface ChangeoverAbilities {
  edit: boolean;
  countersign: boolean;
}

/** A person who may be asked to countersign. */
export interface CountersignerCandidate extends PersonRef {
  role: Role;
  organization: string | null;
}
