import { apiRoute, parseParams } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { csvTemplate } from '@/lib/cells/csv';
import { csvTemplateParamSchema } from '@/lib/schemas/cells';

type Ctx = { params: Promise<{ kind: string }> };

/** A downloadable CSV template (header + example rows) for the point map or the I/O list. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  await requireApiUser(req, ROLE_TABLE.cells);
  const { kind } = await parseParams(ctx.params, csvTemplateParamSchema);
  return new Response(csvTemplate(kind), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${kind}-template.csv"`,
      'cache-control': 'no-store',
    },
  });
});
