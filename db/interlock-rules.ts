import 'server-only';
import type { InterlockRule, InterlockRuleInput } from '@/simulator';
import { db } from './knex';
import { isUuid } from './users';

/**
 * The interlock rules a cell keeps (migration 20261204_402_changeover_evidence): every
 * changeover of the cell proves them on its base and its proposal. A rule is stored as its
 * kind and conditions (`body`); its row id is its id when it is proved.
 */

/** A rule's kind and conditions: the engine's interlock rule without id and title. */
export type InterlockRuleBody = DistributiveOmit<InterlockRuleInput, 'id' | 'title'>;
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

export interface StoredInterlockRule {
  id: string;
  cellId: string;
  position: number;
  title: string;
  body: InterlockRuleBody;
  updatedBy: { id: string; name: string };
  createdAt: string;
  updatedAt: string;
}

/** Most rules one cell keeps (the engine proves at most 500 in one list). */
export const MAX_RULES_PER_CELL = 200;

const iso = (d: Date | string) => new Date(d).toISOString();

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toRule(r: any): StoredInterlockRule {
  return {
    id: r.id,
    cellId: r.cell_id,
    position: r.position,
    title: r.title,
    body: r.body,
    updatedBy: { id: r.updated_by, name: r.updated_by_name ?? '' },
    createdAt: iso(r.created_at),
    updatedAt: iso(r.updated_at),
  };
}

function query() {
  return db()('interlock_rules as r').join('users as u', 'u.id', 'r.updated_by').select('r.*', 'u.name as updated_by_name');
}

/** The engine's rule for a stored one (its id is the row id). */
export function toInterlockRule(r: StoredInterlockRule): InterlockRuleInput {
  return { id: r.id, title: r.title, ...r.body } as InterlockRuleInput;
}

/** The stored body of an engine rule (id and title dropped). */
export function ruleBody(rule: InterlockRule | InterlockRuleInput): InterlockRuleBody {
  const { id: _id, title: _title, ...body } = rule;
  return body as InterlockRuleBody;
}

/** A cell's rules in their order. */
export async function listInterlockRules(cellId: string): Promise<StoredInterlockRule[]> {
  if (!isUuid(cellId)) return [];
  return (await query().where('r.cell_id', cellId).orderBy([{ column: 'r.position' }, { column: 'r.created_at' }])).map(toRule);
}

export async function findInterlockRule(cellId: string, id: string): Promise<StoredInterlockRule | null> {
  if (!isUuid(cellId) || !isUuid(id)) return null;
  const row = await query().where({ 'r.cell_id': cellId, 'r.id': id }).first();
  return row ? toRule(row) : null;
}

export type CreateRuleResult = { ok: true; rule: StoredInterlockRule } | { ok: false; reason: 'full' };

/** Appends a rule to the cell's list (under the cell's row lock, so two appends get two positions). */
export async function createInterlockRule(cellId: string, userId: string, input: { title: string; body: InterlockRuleBody }): Promise<CreateRuleResult> {
  const id = await db().transaction(async (trx) => {
    await trx('cells').where({ id: cellId }).forUpdate().first('id');
    const stats = (await trx('interlock_rules').where({ cell_id: cellId }).select(trx.raw('count(*)::int as n'), trx.raw('max(position) as top')).first()) as { n: number; top: number | null } | undefined;
    if (Number(stats?.n ?? 0) >= MAX_RULES_PER_CELL) return null;
    const [row] = await trx('interlock_rules')
      .insert({ cell_id: cellId, position: (stats?.top ?? 0) + 1, title: input.title, body: JSON.stringify(input.body), created_by: userId, updated_by: userId })
      .returning('id');
    return row.id as string;
  });
  if (!id) return { ok: false, reason: 'full' };
  return { ok: true, rule: (await findInterlockRule(cellId, id))! };
}

export async function updateInterlockRule(cellId: string, id: string, userId: string, input: { title: string; body: InterlockRuleBody }): Promise<StoredInterlockRule | null> {
  if (!isUuid(id)) return null;
  const n = await db()('interlock_rules')
    .where({ cell_id: cellId, id })
    .update({ title: input.title, body: JSON.stringify(input.body), updated_by: userId, updated_at: db().fn.now() });
  return n > 0 ? findInterlockRule(cellId, id) : null;
}

export async function deleteInterlockRule(cellId: string, id: string): Promise<boolean> {
  if (!isUuid(id)) return false;
  return (await db()('interlock_rules').where({ cell_id: cellId, id }).delete()) > 0;
}
