import { apiRoute, parseQuery } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { userListQuerySchema } from '@/lib/schemas/admin';
import { listUsers } from '@/db/users';

/** Admin: one page of users with search, role filter and sort. */
export const GET = apiRoute(async (req: Request) => {
  await requireApiUser(req, ROLE_TABLE.administer);
  const query = parseQuery(req, userListQuerySchema);
  const { rows, total } = await listUsers(query);
  return Response.json({ users: rows, total, page: query.page, pageSize: query.pageSize });
});
