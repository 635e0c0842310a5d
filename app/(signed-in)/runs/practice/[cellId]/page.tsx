import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { Refused } from '@/components/ui/refused';
import { PracticeRun } from '@/components/runs/practice-run';
import { requirePageUser } from '@/lib/auth/session';
import { ApiError } from '@/lib/api/errors';
import { cellForReader } from '@/lib/cells/access';
import { cellIdParamSchema } from '@/lib/schemas/cells';
import { getVersion } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Practice · Cellwright' };

/** A recorded practice run on a cell the user may open (their own, or shared with their cohort). */
export default async function PracticePage({ params }: { params: Promise<{ cellId: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/runs/practice/${raw.cellId}`, ROLE_TABLE.cells);
  if (!allowed) return <Refused role={user.role} needs="students, trainers and maintenance leads" />;
  const parsed = cellIdParamSchema.safeParse({ id: raw.cellId });
  if (!parsed.success) notFound();
  let name: string;
  try {
    name = (await cellForReader(user, parsed.data.id)).cell.name;
  } catch (e) {
    if (e instanceof ApiError && (e.status === 404 || e.status === 403)) notFound();
    throw e;
  }
  const latest = await getVersion(parsed.data.id);
  if (!latest) notFound();
  return <PracticeRun cellId={parsed.data.id} cellName={name} version={latest.version} document={latest.document} />;
}
