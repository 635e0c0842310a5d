import { ApiError, apiRoute, parseParams } from '@/lib/api/errors';
import { parseJsonBody } from '@/lib/api/body';
import { requireApiUser } from '@/lib/auth/session';
import { sendMail } from '@/lib/mail/send';
import { drillForAuthor } from '@/lib/drills/access';
import { assignmentLink, drillAssignedMail } from '@/lib/drills/mail';
import { assignSchema, drillIdParamSchema } from '@/lib/schemas/drills';
import { findCohort } from '@/db/cohorts';
import { cohortStudents, createAssignment, listAssignmentsOfDrill } from '@/db/drills';
import { ROLE_TABLE } from '@/lib/roles';

type Ctx = { params: Promise<{ id: string }> };

/** The drill's assignments. */
export const GET = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  await drillForAuthor(user, id);
  return Response.json({ assignments: await listAssignmentsOfDrill(id) });
});

/**
 * Assign the drill to one of the trainer's cohorts with open and close dates; every student
 * of the cohort gets an e-mail with a link. The assignment stands even if a message fails
 * (the dashboard lists it); the answer says how many were sent.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const user = await requireApiUser(req, ROLE_TABLE.drills);
  const { id } = await parseParams(ctx.params, drillIdParamSchema);
  const drill = await drillForAuthor(user, id);
  const body = await parseJsonBody(req, assignSchema);
  const cohort = await findCohort(body.cohortId);
  if (!cohort) throw new ApiError(422, 'Some fields are not valid.', { cohortId: ['No such cohort.'] });
  if (user.role !== 'admin' && cohort.trainerId !== user.id) throw new ApiError(403, 'You can assign drills only to cohorts you run.');
  const assignment = await createAssignment({ drillId: id, cohortId: cohort.id, opensAt: body.opensAt, closesAt: body.closesAt, assignedBy: user.id });
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
  return Response.json({ assignment, mailed, students: students.length }, { status: 201 });
});
