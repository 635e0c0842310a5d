import type { Metadata } from 'next';
import { UsersTable } from '@/components/admin/users-table';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Users · Cellwright' };

export default async function UsersPage() {
  const { user, allowed } = await requirePageUser('/admin/users', ROLE_TABLE.administer);
  if (!allowed) return <Refused role={user.role} needs="administrators" />;
  return (
    <>
      <PageHeader title="Users" description="Change roles and disable accounts. Every change is written to the audit log." />
      <UsersTable currentUserId={user.id} />
    </>
  );
}
