import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { Role } from '@/lib/roles';
import type { User } from '@/db/users';
import { findDrill } from '@/db/drills';
import { canReadChangeover } from '@/lib/changeovers/access';
import { getJob } from './queue';
import { parseSubject, type JobRecord } from './types';
import { ROLE_TABLE } from '@/lib/roles';

/**
 * Who may read a job: whoever may read its subject. A job's progress and result say as much
 * as the record they are about, so the rule is the record's own.
 */
export interface SubjectReader {
  /** Roles that may read this kind of subject at all; other roles get 403. */
  roles: readonly Role[];
  /** Whether this user may read this record; false answers 404 (ids reveal nothing). */
  canRead(user: User, id: string): Promise<boolean>;
}

/** A drill's jobs: its trainer's and the admins'. */
async function canReadDrill(user: User, id: string): Promise<boolean> {
  const drill = await findDrill(id);
  return Boolean(drill && (user.role === 'admin' || drill.trainerId === user.id));
}

/** Subject kind → who may read it. A new kind of subject is one line here. */
export const SUBJECT_READERS: Record<string, SubjectReader> = {
  drill: { roles: ROLE_TABLE.drills, canRead: canReadDrill },
  changeover: { roles: ROLE_TABLE.changeovers, canRead: canReadChangeover },
};

/**
 * Throws unless `user` may read `subject`'s jobs: 403 for a role that never may, 404 for a
 * subject that does not parse, has no reader, does not exist or is not theirs.
 */
export async function assertCanReadSubject(user: User, subject: string): Promise<void> {
  const parsed = parseSubject(subject.toLowerCase());
  const reader = parsed ? SUBJECT_READERS[parsed.kind] : undefined;
  if (!parsed || !reader) throw new ApiError(404, 'No such subject.');
  if (!reader.roles.includes(user.role)) throw new ApiError(403, 'Your role may not see these jobs.');
  if (!(await reader.canRead(user, parsed.id))) throw new ApiError(404, 'No such subject.');
}

/** True when `user` may read `subject`'s jobs (the stream's periodic re-check). */
export async function canReadSubject(user: User, subject: string): Promise<boolean> {
  try {
    await assertCanReadSubject(user, subject);
    return true;
  } catch (err) {
    if (err instanceof ApiError) return false;
    throw err;
  }
}

/**
 * A job the user may read, for the one-job route: a job of a subject they may not read does
 * not exist for them (404), whatever their role, so job ids reveal nothing.
 */
export async function jobForReader(user: User, id: string): Promise<JobRecord> {
  const job = await getJob(id);
  if (!job || !(await canReadSubject(user, job.subject))) throw new ApiError(404, 'No such job.');
  return job;
}
