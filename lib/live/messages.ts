import 'server-only';
import { env } from '@/lib/env';
import { userFromRequest } from '@/lib/auth/session';
import { assignmentForStudent } from '@/lib/drills/access';
import type { User } from '@/db/users';
import type { Assignment } from '@/db/drills';
import { findRunMessage, listMessagesForStudent } from '@/db/live';
import { subscribeLive } from './listener';
import { sseResponse } from './sse';
import type { StudentMessage } from './types';

/**
 * A student's messages on one assignment as Server-Sent Events: `messages` (all so far, first
 * and after a resync), then `message` for each new one sent to them or to everyone. A message
 * to another student is never read for this stream: the notice names its addressee.
 */
export function studentMessageStream(req: Request, user: User, assignment: Assignment): Response {
  return sseResponse(
    req,
    async (ch) => {
      let queue: Promise<void> = Promise.resolve();
      const enqueue = (work: () => Promise<void>) => {
        queue = queue.then(work).catch((err) => console.error('[live] message stream failed', err));
      };
      const snapshot = async () => ch.send('messages', await listMessagesForStudent(assignment.id, user.id));
      const unsubscribe = await subscribeLive(env().DATABASE_URL, {
        onNotice(n) {
          if (n.kind !== 'message' || n.assignmentId !== assignment.id) return;
          if (n.userId !== null && n.userId !== user.id) return;
          enqueue(async () => {
            const m = await findRunMessage(n.messageId);
            if (!m) return;
            const out: StudentMessage = { id: m.id, kind: m.kind, body: m.body, authorName: m.authorName, createdAt: m.createdAt };
            ch.send('message', out);
          });
        },
        onResync() {
          enqueue(snapshot);
        },
      });
      enqueue(snapshot);
      await queue;
      return unsubscribe;
    },
    async () => {
      const u = await userFromRequest(req);
      if (!u || u.id !== user.id) return false;
      return assignmentForStudent(u, assignment.id).then(
        () => true,
        () => false,
      );
    },
  );
}
