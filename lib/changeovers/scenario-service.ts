import 'server-only';
import { ApiError } from '@/lib/api/errors';
import { cellForOwner } from '@/lib/cells/access';
import { runForReader } from '@/lib/runs/access';
import { storedLog } from '@/lib/runs/service';
import type { User } from '@/db/users';
import { findDrill } from '@/db/drills';
import { createScenario, type CreateScenarioResult, type NewScenario, type Scenario } from '@/db/scenarios';
import type { LoggedEvent } from '@/simulator';
import { MAX_SCENARIO_MS } from '@/lib/schemas/evidence';

/**
 * Scenarios a cell keeps: made from a finished run in one step, or written in the headless
 * runner's formats. A scenario replays operator actions on each version's own logic, so the
 * parts of a run's log that edit the cell — downloads of logic, wiring or routine, staged
 * point-map rows — are left out of it (they would paste the run's edits over the proposal).
 */

/** Log events that edit the cell rather than operate it. */
const EDITS = new Set(['download', 'stage-point-map', 'discard-staged']);

/** A run's log as a scenario's script: operator actions only, and how many edits were left out. */
export function scenarioScript(events: readonly LoggedEvent[]): { events: LoggedEvent[]; leftOut: number } {
  const kept = events.filter((e) => !EDITS.has(e.event.type));
  return { events: kept, leftOut: events.length - kept.length };
}

function created(result: CreateScenarioResult, name: string): Scenario {
  if (result.ok) return result.scenario;
  if (result.reason === 'duplicate') throw new ApiError(409, `The cell already keeps a scenario named “${name}”: choose another name.`, { name: ['This name is taken in this cell.'] });
  throw new ApiError(409, 'The cell keeps as many scenarios as it may: delete one first.');
}

/**
 * Keeps a finished run (practice or drill) as a scenario of the run's cell: the run's operator
 * events, its length, and — for a drill run — the drill's fault cards, grading rules and the
 * run's seed, so the scenario replays the run exactly. The caller must be able to read the run
 * and own its cell (404 / 403 otherwise); the run must be submitted (409).
 */
export async function keepRunAsScenario(user: User, runId: string, input: { name: string; description: string }): Promise<{ scenario: Scenario; leftOut: number }> {
  const { run } = await runForReader(user, runId);
  if (run.status !== 'submitted') throw new ApiError(409, 'Finish the run first: only a finished run can be kept as a scenario.');
  const cell = await cellForOwner(user, run.cellId).catch((e: unknown) => {
    if (e instanceof ApiError && e.status === 404) throw new ApiError(403, 'This run’s cell is not yours: a scenario is kept with the cell by its owner.');
    throw e;
  });
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  const log = await storedLog(run.id);
  const script = scenarioScript(log.events);
  const durationMs = Math.max(run.endedMs ?? log.untilMs, script.events.at(-1)?.t ?? 0);
  if (durationMs > MAX_SCENARIO_MS) throw new ApiError(409, `This run is longer than a scenario may be (${MAX_SCENARIO_MS / 3_600_000} h of cell time).`);
  const scenario: NewScenario = {
    cellId: cell.id,
    name: input.name,
    description: input.description || (drill ? `Kept from ${run.userName}’s run of the drill “${drill.title}”.` : `Kept from ${run.userName}’s practice run.`),
    events: script.events,
    rules: drill ? drill.rules.map((w) => w.rule) : [],
    faults: drill ? drill.faults : [],
    seed: run.seed,
    durationMs,
    sourceRunId: run.id,
    createdBy: user.id,
  };
  return { scenario: created(await createScenario(scenario), input.name), leftOut: script.leftOut };
}

/** Adds a scenario written in the headless runner's formats to a cell the user owns. */
export async function addScenario(user: User, cellId: string, input: Omit<NewScenario, 'cellId' | 'sourceRunId' | 'createdBy'>): Promise<Scenario> {
  const cell = await cellForOwner(user, cellId);
  return created(await createScenario({ ...input, cellId: cell.id, sourceRunId: null, createdBy: user.id }), input.name);
}
