import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { Refused } from '@/components/ui/refused';
import { Workspace } from '@/components/workspace/shell/workspace-shell';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { cellForReader } from '@/lib/cells/access';
import { cellIdParamSchema } from '@/lib/schemas/cells';
import { getVersion } from '@/db/cells';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Cell workspace · Cellwright' };

/**
 * The cell workspace. The server checks the session and that the user may read this cell
 * (their own, or shared with their cohort: run only), then hands the latest version to the
 * client island, which runs it in a Web Worker.
 */
export default async function CellWorkspacePage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/cells/${raw.id}`, ROLE_TABLE.cells);
  if (!allowed) return <Refused role={user.role} needs="students, trainers and maintenance leads" />;
  const { id } = paramsOrNotFound(cellIdParamSchema, raw);
  // A cell the reader may not open is not-found either way (403 or 404): its id reveals nothing.
  const { access, cell } = await loadOrNotFound(cellForReader(user, id), [404, 403]);
  const latest = await getVersion(id);
  if (!latest) notFound();

  return <Workspace cellName={cell.name} init={{ cellId: id, version: latest.version, document: latest.document, canEdit: access === 'owner' }} />;
}
