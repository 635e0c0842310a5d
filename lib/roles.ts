export const ROLES = ['student', 'trainer', 'lead', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  student: 'Student',
  trainer: 'Trainer',
  lead: 'Maintenance lead',
  admin: 'Administrator',
};

/** Who may run cohorts: trainers own theirs, admins see all. */
export const COHORT_ROLES: readonly Role[] = ['trainer', 'admin'];

export interface NavItem {
  href: string;
  label: string;
  icon: 'dashboard' | 'cells' | 'cohorts' | 'users' | 'mailbox' | 'drills' | 'runs' | 'gradebook' | 'changeovers' | 'plcLink';
}

/**
 * Navigation per role. Later issues add their areas (cells, runs, drills,
 * gradebook, changeovers) here when their pages exist.
 */
export function navFor(role: Role): NavItem[] {
  const items: NavItem[] = [{ href: '/dashboard', label: 'Dashboard', icon: 'dashboard' }];
  if (role !== 'admin') items.push({ href: '/cells', label: 'Cells', icon: 'cells' });
  if (role === 'trainer' || role === 'admin') items.push({ href: '/cohorts', label: 'Cohorts', icon: 'cohorts' });
  if (role === 'student') items.push({ href: '/drills', label: 'Drills', icon: 'drills' }, { href: '/runs', label: 'Runs', icon: 'runs' });
  if (role === 'trainer') items.push({ href: '/drills', label: 'Drills', icon: 'drills' }, { href: '/gradebook', label: 'Gradebook', icon: 'gradebook' });
  // The admin reads every changeover and may countersign one.
  if (role !== 'student') items.push({ href: '/changeovers', label: 'Changeovers', icon: 'changeovers' });
  // A PLC link opens a listening port on the server: trainers and leads run it on a bench (docs/plc-link.md).
  if (role === 'trainer' || role === 'lead') items.push({ href: '/plc-link', label: 'PLC link', icon: 'plcLink' });
  if (role === 'admin') {
    items.push({ href: '/admin/users', label: 'Users', icon: 'users' });
    items.push({ href: '/admin/mailbox', label: 'Mailbox', icon: 'mailbox' });
  }
  return items;
}
