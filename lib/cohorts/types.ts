/**
 * Cohort shapes as db/cohorts.ts returns them and the cohort route handlers answer them (dates
 * as ISO strings). Here rather than in db/ so client components can import them: db/ modules
 * are server-only.
 */
export interface CohortSummary {
  id: string;
  name: string;
  description: string;
  trainerId: string;
  trainerName: string;
  memberCount: number;
  pendingCount: number;
  createdAt: string;
}

export interface CohortMember {
  userId: string;
  name: string;
  email: string;
  joinedAt: string;
}

export interface PendingInvitation {
  id: string;
  email: string;
  invitedByName: string;
  createdAt: string;
  expiresAt: string;
}

export interface CohortDetail extends CohortSummary {
  members: CohortMember[];
  invitations: PendingInvitation[];
}
