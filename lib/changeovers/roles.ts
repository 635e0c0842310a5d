import type { Role } from '@/lib/roles';

/** Who has changeovers at all: leads and trainers open them on their own cells; the admin reads and countersigns any. */
export const CHANGEOVER_ROLES: readonly Role[] = ['trainer', 'lead', 'admin'];
/** Who opens a changeover (on a cell they own). */
export const OPEN_CHANGEOVER_ROLES: readonly Role[] = ['trainer', 'lead'];
/** Who may countersign another person's signature. */
export const COUNTERSIGN_ROLES: readonly Role[] = ['trainer', 'lead', 'admin'];
