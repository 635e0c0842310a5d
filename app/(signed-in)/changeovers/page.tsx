import type { Metadata } from 'next';
import { ChangeoversList } from '@/components/changeovers/changeovers-list';
import { ChangeoverCaution } from '@/components/changeovers/changeover-caution';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { listChangeoversFor } from '@/db/changeovers';
import { listOwnedCells } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Changeovers · Cellwright' };

/** The changeovers a lead or trainer keeps (and those they are asked to countersign); the admin sees all. */
export default async function ChangeoversPage() {
  const { user, allowed } = await requirePageUser('/changeovers', ROLE_TABLE.changeovers);
  if (!allowed) return <Refused role={user.role} needs="maintenance leads, trainers and administrators" />;
  const canOpen = ROLE_TABLE.openChangeovers.includes(user.role);
  const [changeovers, cells] = await Promise.all([listChangeoversFor(user), canOpen ? listOwnedCells(user.id) : Promise.resolve([])]);
  return (
    <>
      <PageHeader
        title="Changeovers"
        description="A planned change to a cell: the version that runs today, the proposal, what differs between them, the proofs and scenario checks, two signatures, and a way back."
      />
      <div className="space-y-6">
        <ChangeoverCaution compact />
        <ChangeoversList initial={changeovers} cells={cells.map((c) => ({ id: c.id, name: c.name, latestVersion: c.latestVersion }))} canOpen={canOpen} />
      </div>
    </>
  );
}
