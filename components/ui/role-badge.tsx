import { ROLE_LABELS } from '@/lib/roles';
import type { Role } from '@/lib/roles';

export function RoleBadge({ role }: { role: Role }) {
  return (
    <span data-testid="role-badge" className="inline-flex rounded-full border border-slate-300 bg-slate-100 px-2 py-0.5 text-xs font-medium text-slate-700">
      {ROLE_LABELS[role]}
    </span>
  );
}
