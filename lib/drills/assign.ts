import 'server-only';
import { sendMail } from '@/lib/mail/send';
import type { CohortSummary } from '@/db/cohorts';
import { cohortStudents, createAssignment, type Assignment, type Drill } from '@/db/drills';
import type { User } from '@/db/users';
import { assignmentLink, drillAssignedMail } from './mail';

/**
 * Assigns the drill to the cohort with open and close dates and mails every student of the
 * cohort a link. The assignment stands even if a message fails (the dashboard lists it; the
 * failure is logged): the answer says how many were sent.
 */
export async function assignDrill(
  user: User,
  drill: Drill,
  cohort: CohortSummary,
  dates: { opensAt: string; closesAt: string },
): Promise<{ assignment: Assignment; mailed: number; students: number }> {
  const assignment = await createAssignment({ drillId: drill.id, cohortId: cohort.id, opensAt: dates.opensAt, closesAt: dates.closesAt, assignedBy: user.id });
  const students = await cohortStudents(cohort.id);
  let mailed = 0;
  for (const s of students) {
    try {
      await sendMail(
        drillAssignedMail({
          to: s.email,
          name: s.name,
          drillTitle: drill.title,
          cohortName: cohort.name,
          trainerName: user.name,
          opensAt: assignment.opensAt,
          closesAt: assignment.closesAt,
          link: assignmentLink(assignment.id),
        }),
      );
      mailed += 1;
    } catch (err) {
      console.error('[drills] assignment mail failed', s.email, err);
    }
  }
  return { assignment, mailed, students: students.length };
}
