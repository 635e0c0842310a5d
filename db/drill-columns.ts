import type { DrillInput } from './types/drills';

/**
 * The `drills` columns a drill's input fills (JSON columns serialised), shared by the data
 * functions (db/drills.ts) and the demo seed. Not `server-only`: seeds run outside Next.js.
 */
export function drillColumns(input: DrillInput) {
  return {
    title: input.title,
    cell_id: input.cellId,
    cell_version: input.cellVersion,
    brief: input.brief,
    faults: JSON.stringify(input.faults),
    objectives: JSON.stringify(input.objectives),
    rules: JSON.stringify(input.rules),
    answer_kind: input.answer.kind,
    answer_location: input.answer.location,
    diagnosis_weight: input.diagnosisWeight,
    time_limit_ms: input.timeLimitMs,
    permissions: JSON.stringify(input.permissions),
  };
}
