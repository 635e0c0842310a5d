import type { Role } from '@/lib/roles';

/** Who works with cells: students, trainers and leads own cells; admins run accounts, not cells. */
export const CELL_ROLES: readonly Role[] = ['student', 'trainer', 'lead'];
/** Who may share a cell with a cohort (trainers their own cohorts, leads any cohort). */
export const SHARE_ROLES: readonly Role[] = ['trainer', 'lead'];
/** Who opens a shared cell as their own copy. */
export const COPY_ROLES: readonly Role[] = ['student'];
