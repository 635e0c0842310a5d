/** JSON shapes the cohort route handlers answer with (dates as ISO strings). */
export interface CohortSummaryDto {
  id: string;
  name: string;
  description: string;
  trainerId: string;
  trainerName: string;
  memberCount: number;
  pendingCount: number;
  createdAt: string;
}

export interface CohortDetailDto extends CohortSummaryDto {
  members: { userId: string; name: string; email: string; joinedAt: string }[];
  invitations: { id: string; email: string; invitedByName: string; createdAt: string; expiresAt: string }[];
}
