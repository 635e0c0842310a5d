import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';
import { changeoverReportDownload } from '@/lib/reports/changeover-report-files';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The printed report of the signed record (PDF), for the record's readers (the same check as
 * GET …/record): 404 before sign-off, 503 with Retry-After while the job prints it. Streamed
 * from the bucket, never a link into it.
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForReader(user, id);
  return changeoverReportDownload(co, user.id);
});
