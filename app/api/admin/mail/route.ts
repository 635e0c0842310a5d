import { apiRoute } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { listMail } from '@/db/mail';
import { ROLE_TABLE } from '@/lib/roles';

/** Admin: the newest messages captured by the local SMTP catcher. */
export const GET = apiRoute(async (req: Request) => {
  await requireApiUser(req, ROLE_TABLE.administer);
  return Response.json({ messages: await listMail(200) });
});
