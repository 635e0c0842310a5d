import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findCell, getVersion } from '@/db/cells';
import { drillHasRuns, updateDrillUnlessFrozen, type Drill } from '@/db/drills';
import type { DrillInput } from '@/lib/schemas/drills';
import { drillProblems } from './validate';

/**
 * Checks a drill before it is stored: the base cell exists and is the author's own (an admin
 * may use any), the version exists, and the fault cards, rules and answer fit that version
 * (lib/drills/validate.ts). 422 with field errors otherwise; nothing is stored.
 */
export async function checkDrillInput(user: User, input: DrillInput): Promise<void> {
  const cell = await findCell(input.cellId);
  if (!cell || (user.role !== 'admin' && cell.ownerId !== user.id)) throw new ApiError(422, 'Some fields are not valid.', { cellId: ['No such cell of yours.'] });
  const version = await getVersion(input.cellId, input.cellVersion);
  if (!version) throw new ApiError(422, 'Some fields are not valid.', { cellVersion: ['The cell has no such version.'] });
  const problems = drillProblems(version.document, input);
  if (Object.keys(problems).length > 0) throw new ApiError(422, 'The drill does not fit its base cell.', problems);
}

/** A stored drill as a complete input (for a partial update). */
export function drillAsInput(d: Drill): DrillInput {
  return {
    title: d.title,
    cellId: d.cellId,
    cellVersion: d.cellVersion,
    brief: d.brief,
    faults: d.faults,
    objectives: d.objectives,
    rules: d.rules,
    answer: d.answer,
    diagnosisWeight: d.diagnosisWeight,
    timeLimitMs: d.timeLimitMs,
    permissions: d.permissions,
  };
}

const frozen = () => new ApiError(409, 'Students have started this drill; its faults and grading can no longer change. Create a new drill instead.');

/**
 * Changes a drill with the fields given (the rest stay). Once anyone has started a run its
 * grading inputs are frozen (409), so a regrade of any stored run always gives its stored
 * grade: duplicate the drill instead. Checked before the work and again under the row lock.
 */
export async function updateDrill(user: User, drill: Drill, patch: Partial<DrillInput>): Promise<Drill> {
  if (await drillHasRuns(drill.id)) throw frozen();
  const input: DrillInput = { ...drillAsInput(drill), ...Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined)) };
  await checkDrillInput(user, input);
  const updated = await updateDrillUnlessFrozen(drill.id, input);
  if (updated === 'frozen') throw frozen();
  if (!updated) throw new ApiError(404, 'No such drill.');
  return updated;
}
