// Cohort shapes: stored below db/ and lib/ (db/types/cohorts.ts); re-exported for the browser.
export type { CohortDetail, CohortMember, CohortSummary, PendingInvitation } from '@/db/types/cohorts';
