import type { Metadata } from 'next';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { Notice } from '@/components/ui/notice';
import { DrillEditor } from '@/components/drills/drill-editor';
import { requirePageUser } from '@/lib/auth/session';
import { listOwnedCells } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'New drill · Cellwright' };

export default async function NewDrillPage() {
  const { user, allowed } = await requirePageUser('/drills/new', ROLE_TABLE.drills);
  if (!allowed) return <Refused role={user.role} needs="trainers" />;
  const cells = (await listOwnedCells(user.id)).map((c) => ({ id: c.id, name: c.name, versionCount: c.versionCount }));
  return (
    <>
      <PageHeader title="New drill" description="Start from one of your cells: the drill keeps the chosen version, so later edits of the cell do not change it." />
      {cells.length === 0 ? (
        <Notice>You have no cells yet. Create one under Cells first.</Notice>
      ) : (
        <DrillEditor drillId={null} initial={null} cells={cells} locked={false} />
      )}
    </>
  );
}
