// The roles are stored on accounts: their list lives below db/ and lib/ (db/types/users.ts).
import type { Role } from '@/db/types/users';
export { ROLES, type Role } from '@/db/types/users';

export const ROLE_LABELS: Record<Role, string> = {
  student: 'Student',
  trainer: 'Trainer',
  lead: 'Maintenance lead',
  admin: 'Administrator',
};

/**
 * The one role table: which roles may do what. Route handlers pass a row to
 * `requireApiUser`, pages to `requirePageUser`, the access modules (lib/<area>/access.ts)
 * read it for their own checks, and the role × route matrix
 * (tests/integration/route-matrix.test.ts) checks every route against the row it names.
 * A role outside a row gets 403; who owns which record is the access modules' business.
 */
const TABLE = {
  /** Own cells, open cells shared with their cohorts, run practice runs. Admins run accounts, not cells. */
  cells: ['student', 'trainer', 'lead'],
  /** Share a cell with a cohort (trainers their own cohorts, leads any cohort). */
  shareCells: ['trainer', 'lead'],
  /** Open a cell shared with their cohort as their own copy. */
  copySharedCells: ['student'],
  /** Keep interlock rules and scenarios on their own cells, keep a run as a scenario. */
  cellEvidence: ['trainer', 'lead'],
  /** Run cohorts: trainers their own, admins any. */
  cohorts: ['trainer', 'admin'],
  /** Join a cohort with an invitation link while signed in. */
  joinCohorts: ['student'],
  /** Author drills, assign them, watch them live, grade them: trainers their own, admins any. */
  drills: ['trainer', 'admin'],
  /** Attempt an assigned drill. */
  attemptDrills: ['student'],
  /** List assignments: students those given to them, trainers those of their drills, admins all. */
  assignments: ['student', 'trainer', 'admin'],
  /** Have changeovers at all: leads and trainers open them on their own cells; the admin reads and countersigns any. */
  changeovers: ['trainer', 'lead', 'admin'],
  /** Open a changeover (on a cell they own). */
  openChangeovers: ['trainer', 'lead'],
  /** Countersign another person's signature. */
  countersign: ['trainer', 'lead', 'admin'],
  /** Run a PLC link: it opens a listening port on the server (docs/plc-link.md). */
  plcLink: ['trainer', 'lead'],
  /** Manage accounts and read the local mailbox. */
  administer: ['admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Ability = keyof typeof TABLE;

/** Each row widened to `readonly Role[]`, so `ROLE_TABLE.cells.includes(user.role)` type-checks. */
export const ROLE_TABLE: Readonly<Record<Ability, readonly Role[]>> = TABLE;

/** True when `role` is in the table's row for `ability`. */
export function may(role: Role, ability: Ability): boolean {
  return ROLE_TABLE[ability].includes(role);
}

export interface NavItem {
  href: string;
  label: string;
  icon: 'dashboard' | 'cells' | 'cohorts' | 'users' | 'mailbox' | 'drills' | 'runs' | 'gradebook' | 'changeovers' | 'plcLink';
}

/** Navigation per role, from the role table (an area appears for the roles that may use it). */
export function navFor(role: Role): NavItem[] {
  const items: NavItem[] = [{ href: '/dashboard', label: 'Dashboard', icon: 'dashboard' }];
  if (may(role, 'cells')) items.push({ href: '/cells', label: 'Cells', icon: 'cells' });
  if (may(role, 'cohorts')) items.push({ href: '/cohorts', label: 'Cohorts', icon: 'cohorts' });
  if (may(role, 'attemptDrills')) items.push({ href: '/drills', label: 'Drills', icon: 'drills' }, { href: '/runs', label: 'Runs', icon: 'runs' });
  // Admins may open the drill pages and the gradebook too (ROLE_TABLE.drills); their menu stays on accounts.
  if (role === 'trainer') items.push({ href: '/drills', label: 'Drills', icon: 'drills' }, { href: '/gradebook', label: 'Gradebook', icon: 'gradebook' });
  // The admin reads every changeover and may countersign one.
  if (may(role, 'changeovers')) items.push({ href: '/changeovers', label: 'Changeovers', icon: 'changeovers' });
  if (may(role, 'plcLink')) items.push({ href: '/plc-link', label: 'PLC link', icon: 'plcLink' });
  if (may(role, 'administer')) {
    items.push({ href: '/admin/users', label: 'Users', icon: 'users' });
    items.push({ href: '/admin/mailbox', label: 'Mailbox', icon: 'mailbox' });
  }
  return items;
}
