import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { PlcLinkCaution } from '@/components/plc-link/plc-link-caution';
import { PlcLinkSession } from '@/components/plc-link/plc-link-session';
import { PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { ApiError } from '@/lib/api/errors';
import { sessionForOwner, sessionMap, viewOf } from '@/lib/plc-link/sessions';
import { plcLinkIdParamSchema } from '@/lib/plc-link/schemas';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'PLC link session · Cellwright' };

export default async function PlcLinkSessionPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/plc-link/${raw.id}`, ROLE_TABLE.plcLink);
  if (!allowed) return <Refused role={user.role} needs="trainers and maintenance leads" />;
  const parsed = plcLinkIdParamSchema.safeParse(raw);
  if (!parsed.success) notFound();
  let session;
  try {
    session = sessionForOwner(user, parsed.data.id);
  } catch (err) {
    if (err instanceof ApiError && err.status === 404) notFound();
    throw err;
  }
  const view = viewOf(session);
  return (
    <>
      <PageHeader
        title={`PLC link: ${view.cellName}`}
        description={`Version ${view.cellVersion}. The cell runs on the server in real time; this page follows it read-only. The PLC's writes are kept as a run you can replay.`}
      />
      <div className="grid gap-4">
        <PlcLinkCaution />
        <PlcLinkSession initial={view} map={sessionMap(session)} />
      </div>
    </>
  );
}
