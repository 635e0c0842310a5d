import type { Metadata } from 'next';
import { CellsList } from '@/components/cells/cells-list';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Cells · Cellwright' };

export default async function CellsPage() {
  const { user, allowed } = await requirePageUser('/cells', ROLE_TABLE.cells);
  if (!allowed) return <Refused role={user.role} needs="students, trainers and maintenance leads" />;
  const description =
    user.role === 'student'
      ? 'Your cells, and the cells your trainer shared with your cohort: open your own copy to work on it.'
      : 'Your cells. Each save is a new version; share a cell with a cohort and each student works on their own copy.';
  return (
    <>
      <PageHeader title="Cells" description={description} />
      <CellsList canShare={ROLE_TABLE.shareCells.includes(user.role)} isStudent={user.role === 'student'} />
    </>
  );
}
