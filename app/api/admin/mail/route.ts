import { apiRoute } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { ROLE_TABLE } from '@/lib/roles';
import { listMail } from '@/db/mail';

/** Admin: the newest messages captured by the local SMTP catcher. */
export const GET = apiRoute(async (req: Request) => {
  await requireApiUser(req, ROLE_TABLE.administer);
  return Response.json({ messages: await listMail(200) });
});
