import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { Refused } from '@/components/ui/refused';
import { DrillPreview } from '@/components/drills/drill-preview';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { drillForAuthor } from '@/lib/drills/access';
import { drillIdParamSchema } from '@/lib/schemas/drills';
import { getVersion } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Drill preview · Cellwright' };

/** The drill as a student would attempt it, with the trainer's full view of the hidden faults. */
export default async function DrillPreviewPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/drills/${raw.id}/preview`, ROLE_TABLE.drills);
  if (!allowed) return <Refused role={user.role} needs="trainers" />;
  const { id } = paramsOrNotFound(drillIdParamSchema, raw);
  const drill = await loadOrNotFound(drillForAuthor(user, id));
  const version = await getVersion(drill.cellId, drill.cellVersion);
  if (!version) notFound();
  return (
    <DrillPreview
      drill={{
        id: drill.id,
        title: drill.title,
        brief: drill.brief,
        objectives: drill.objectives,
        faults: drill.faults,
        answer: drill.answer,
        timeLimitMs: drill.timeLimitMs,
        permissions: { forceAllowed: drill.permissions.forceAllowed, editable: [...drill.permissions.editable] },
        cellId: drill.cellId,
        cellVersion: drill.cellVersion,
      }}
      document={version.document}
    />
  );
}
