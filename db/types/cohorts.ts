/** Cohort shapes as db/cohorts.ts returns them and the cohort routes answer them (dates as ISO strings). See db/types/users.ts for why here. */

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
