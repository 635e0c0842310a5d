import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { downloadName } from '@/lib/cells/download';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverIoSheet } from '@/lib/changeovers/diff';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';

type Ctx = { params: Promise<{ id: string }> };

/**
 * The I/O change sheet as CSV: what the electricians re-terminate between base and proposal
 * (columns in simulator/diff/io-sheet.ts; formula-looking cells neutralised).
 */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.changeovers);
  const { id } = await parseParams(ctx.params, changeoverIdParamSchema);
  const co = await changeoverForReader(user, id);
  const { baseVersion, proposedVersion, sheet } = await changeoverIoSheet(co);
  return new Response(sheet.csv, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${downloadName(co.cellName)}-io-changes-v${baseVersion}-to-v${proposedVersion}.csv"`,
      'cache-control': 'no-store',
    },
  });
});
