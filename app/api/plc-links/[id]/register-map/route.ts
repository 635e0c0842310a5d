import { apiRoute, parseParams, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { downloadName } from '@/lib/cells/download';
import { registerMapCsv } from '@/lib/plc-link/register-map';
import { sessionForOwner, sessionMap } from '@/lib/plc-link/sessions';
import { plcLinkIdParamSchema, registerMapQuerySchema } from '@/lib/plc-link/schemas';

export const dynamic = 'force-dynamic';
type Ctx = { params: Promise<{ id: string }> };

/** The session's register map: CSV (table, offset, address, label, direction), or JSON with `?format=json` (another format: 400). */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.plcLink);
  const { id } = await parseParams(ctx.params, plcLinkIdParamSchema);
  const { format } = parseQuery(req, registerMapQuerySchema);
  const s = sessionForOwner(user, id);
  const rows = sessionMap(s);
  if (format === 'json') return Response.json({ rows });
  return new Response(registerMapCsv(rows), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${downloadName(`${s.cellName} register map`)}.csv"`,
      'cache-control': 'no-store',
    },
  });
});
