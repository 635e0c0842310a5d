import { busy, apiRoute, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { assertCanReadSubject } from '@/lib/jobs';
import { jobEventStream, jobStreamCapacity } from '@/lib/jobs/stream';
import { jobStreamQuerySchema } from '@/lib/schemas/jobs';

export const dynamic = 'force-dynamic';

/**
 * Server-Sent Events of a subject's jobs (`?subject=drill:<id>`): a snapshot, then every
 * change as it is committed, from whichever process made it (lib/jobs/stream.ts). 401 without
 * a session, 403 for a role that never reads such subjects, 404 for one that is not theirs.
 */
export const GET = apiRoute(async (req: Request) => {
  const user = await requireApiUser(req);
  const { subject } = parseQuery(req, jobStreamQuerySchema);
  await assertCanReadSubject(user, subject);
  if (!jobStreamCapacity()) throw busy('Too many progress streams are open on this server; try again shortly.', 5);
  return jobEventStream(req, subject);
});
