import 'server-only';
import type { FaultCard, LoggedEvent, Rule } from '@/simulator';
import { db } from './knex';
import { isUuid } from './users';

/**
 * Named scenarios a cell keeps (migration 20261204_402_changeover_evidence): an event script
 * and trace rules in the headless runner's formats, plus the fault cards and seed of the drill
 * run a scenario was made from. A changeover's checks re-run every one on base and proposal.
 */
export interface Scenario {
  id: string;
  cellId: string;
  name: string;
  description: string;
  events: LoggedEvent[];
  rules: Rule[];
  faults: FaultCard[];
  /** The run's seed; null runs with the cell document's own seed. */
  seed: number | null;
  durationMs: number;
  sourceRunId: string | null;
  createdBy: { id: string; name: string };
  createdAt: string;
  updatedAt: string;
}

/** A scenario without its event script (lists). */
export type ScenarioSummary = Omit<Scenario, 'events'> & { eventCount: number };

/** Most scenarios one cell keeps. */
export const MAX_SCENARIOS_PER_CELL = 100;

const iso = (d: Date | string) => new Date(d).toISOString();

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toScenario(r: any): Scenario {
  return {
    id: r.id,
    cellId: r.cell_id,
    name: r.name,
    description: r.description,
    events: r.events ?? [],
    rules: r.rules ?? [],
    faults: r.faults ?? [],
    seed: r.seed === null || r.seed === undefined ? null : Number(r.seed),
    durationMs: Number(r.duration_ms),
    sourceRunId: r.source_run_id,
    createdBy: { id: r.created_by, name: r.created_by_name ?? '' },
    createdAt: iso(r.created_at),
    updatedAt: iso(r.updated_at),
  };
}

function query() {
  return db()('cell_scenarios as s').join('users as u', 'u.id', 's.created_by');
}

/** A cell's scenarios by name, without their event scripts. */
export async function listScenarios(cellId: string): Promise<ScenarioSummary[]> {
  if (!isUuid(cellId)) return [];
  const rows = await query()
    .where('s.cell_id', cellId)
    .orderBy('s.name')
    .select(
      's.id',
      's.cell_id',
      's.name',
      's.description',
      's.rules',
      's.faults',
      's.seed',
      's.duration_ms',
      's.source_run_id',
      's.created_by',
      's.created_at',
      's.updated_at',
      'u.name as created_by_name',
      db().raw('jsonb_array_length(s.events)::int as event_count'),
    );
  return rows.map((r) => {
    const { events: _e, ...rest } = toScenario(r);
    return { ...rest, eventCount: r.event_count };
  });
}

/** Every scenario of a cell with its script, by name (the checks job). */
export async function listScenariosWithEvents(cellId: string): Promise<Scenario[]> {
  if (!isUuid(cellId)) return [];
  return (await query().where('s.cell_id', cellId).orderBy('s.name').select('s.*', 'u.name as created_by_name')).map(toScenario);
}

export async function findScenario(cellId: string, id: string): Promise<Scenario | null> {
  if (!isUuid(cellId) || !isUuid(id)) return null;
  const row = await query().where({ 's.cell_id': cellId, 's.id': id }).select('s.*', 'u.name as created_by_name').first();
  return row ? toScenario(row) : null;
}

export interface NewScenario {
  cellId: string;
  name: string;
  description: string;
  events: LoggedEvent[];
  rules: Rule[];
  faults: FaultCard[];
  seed: number | null;
  durationMs: number;
  sourceRunId: string | null;
  createdBy: string;
}

export type CreateScenarioResult = { ok: true; scenario: Scenario } | { ok: false; reason: 'duplicate' | 'full' };

const isUniqueViolation = (e: unknown) => (e as { code?: string }).code === '23505';

/** Adds a scenario; its name must be new in the cell (409 otherwise). */
export async function createScenario(input: NewScenario): Promise<CreateScenarioResult> {
  try {
    const id = await db().transaction(async (trx) => {
      await trx('cells').where({ id: input.cellId }).forUpdate().first('id');
      const count = await trx('cell_scenarios').where({ cell_id: input.cellId }).count<{ n: string }[]>({ n: '*' }).first();
      if (Number(count?.n ?? 0) >= MAX_SCENARIOS_PER_CELL) return null;
      const [row] = await trx('cell_scenarios')
        .insert({
          cell_id: input.cellId,
          name: input.name,
          description: input.description,
          events: JSON.stringify(input.events),
          rules: JSON.stringify(input.rules),
          faults: JSON.stringify(input.faults),
          seed: input.seed,
          duration_ms: input.durationMs,
          source_run_id: input.sourceRunId,
          created_by: input.createdBy,
        })
        .returning('id');
      return row.id as string;
    });
    if (!id) return { ok: false, reason: 'full' };
    return { ok: true, scenario: (await findScenario(input.cellId, id))! };
  } catch (e) {
    if (isUniqueViolation(e)) return { ok: false, reason: 'duplicate' };
    throw e;
  }
}

export type UpdateScenarioResult = { ok: true; scenario: Scenario } | { ok: false; reason: 'duplicate' | 'missing' };

/** Renames a scenario, rewrites its description or its rules. */
export async function updateScenario(cellId: string, id: string, patch: { name?: string; description?: string; rules?: Rule[] }): Promise<UpdateScenarioResult> {
  if (!isUuid(id)) return { ok: false, reason: 'missing' };
  const update: Record<string, unknown> = { updated_at: db().fn.now() };
  if (patch.name !== undefined) update.name = patch.name;
  if (patch.description !== undefined) update.description = patch.description;
  if (patch.rules !== undefined) update.rules = JSON.stringify(patch.rules);
  try {
    const n = await db()('cell_scenarios').where({ cell_id: cellId, id }).update(update);
    if (n === 0) return { ok: false, reason: 'missing' };
  } catch (e) {
    if (isUniqueViolation(e)) return { ok: false, reason: 'duplicate' };
    throw e;
  }
  return { ok: true, scenario: (await findScenario(cellId, id))! };
}

export async function deleteScenario(cellId: string, id: string): Promise<boolean> {
  if (!isUuid(id)) return false;
  return (await db()('cell_scenarios').where({ cell_id: cellId, id }).delete()) > 0;
}
