import { apiRoute } from '@/lib/api/errors';
import { requireApiUser } from '@/lib/auth/session';
import { listMail } from '@/db/mail';

/** Admin: the newest messages captured by the local SMTP catcher. */
export const GET = apiRoute(async (req: Request) => {
  await requireApiUser(req, ['admin']);
  return Response.json({ messages: await listMail(200) });
});
