import type { Metadata } from 'next';
import { Mailbox } from '@/components/admin/mailbox';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Mailbox · Cellwright' };

export default async function MailboxPage() {
  const { user, allowed } = await requirePageUser('/admin/mailbox', ROLE_TABLE.administer);
  if (!allowed) return <Refused role={user.role} needs="administrators" />;
  return (
    <>
      <PageHeader title="Mailbox" description="Messages the app sent, as captured by the local SMTP catcher." />
      <Mailbox />
    </>
  );
}
