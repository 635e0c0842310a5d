import type { Knex } from 'knex';
import { cellDocumentSchema, type CellDocument } from '@/simulator';
import { hashPassword } from '@/lib/password';
import { DEMO_CELL_NAMES } from './demo-cells';

const MARKER = 'demo-changeovers-v1';

/** The plant's shift lead, who countersigns the demo lead's changeovers (invented). */
export const DEMO_COUNTERSIGNER = {
  email: 'shift.lead@brennick.test',
  name: 'Kasimir Thorne',
  role: 'lead',
  password: 'lead-demo-2026',
  organization: 'Brennick Fasteners, Tallowmere plant',
} as const;

export const DEMO_CHANGEOVER = {
  title: 'Rear guard door and DI card to slot 6',
  description:
    'Line 3 gets a second guard door at the rear (parts infeed). Its NC guard switch lands on %IX0.7 and is ANDed into ' +
    'the start permit; an open rear door also lights the yellow tier. At the same shutdown the controller\'s digital-input ' +
    'card in rack 1 moves from slot 2 to slot 6 (slot 2 has a bent backplane pin), so every point of DI1–DI6 and the recipe word is ' +
    're-terminated on the new card. Weekend shutdown, planned Saturday 06:00.',
  proposalMessage: 'Rear guard door on %IX0.7 (start permit, yellow tier); DI card from slot 2 to slot 6',
} as const;

/**
 * The demo lead's changeover proposal, made from the plant's pick-and-place cell as it runs
 * today. What a lead would really do before a weekend shutdown:
 * 1. a second guard door: guard switch `rearGuard` (NC) wired to %IX0.7; contacts `rearGuardOk`
 *    and `rearGuardOpen`; a new AND `guardsClosed` (front AND rear) now feeds the start permit
 *    (connection c6 re-pointed), and an open rear door lights the yellow tier (yellowNeeded 2 → 3
 *    inputs). One path is missed: the guard signal passed to the robot (%QX0.3, which holds the
 *    arm when a guard opens) still comes from the front guard alone — so an interlock rule
 *    "%QX0.3 only if %IX0.4 and %IX0.7" is violated on the proposal and the proof shows it;
 * 2. the controller's digital-input card `ctl-di` moved from rack 1 slot 2 to slot 6: the module, the
 *    point-map ranges DI1–DI6 and WI1, and every wire that lands on the card.
 * Addresses for the evidence seed's rules and scenarios: front guard %IX0.4, rear guard
 * %IX0.7, start request %QX0.0, guard closed to robot %QX0.3, yellow tier %QX1.1.
 */
export function demoChangeoverProposal(base: CellDocument): CellDocument {
  const p = structuredClone(base);
  const sheet = p.plc.sheet;
  const block = (id: string) => {
    const b = sheet.blocks.find((x) => x.id === id);
    if (!b) throw new Error(`demo changeover: block ${id} is missing from the base cell`);
    return b;
  };

  // 1. The rear guard door.
  p.field.push({ id: 'rearGuard', type: 'guard-switch', label: 'Rear guard door', contact: 'NC' });
  p.wiring.push({ id: 'w-rear-guard', from: { device: 'rearGuard', terminal: 'contact' }, to: { plc: '%IX0.7' } });
  sheet.blocks.push(
    { id: 'rearGuardOk', type: 'NO_CONTACT', position: { x: -220, y: 60 }, params: { address: '%IX0.7' }, label: 'Rear guard closed' },
    { id: 'guardsClosed', type: 'AND', position: { x: 160, y: 105 }, params: { inputs: 2 }, label: 'Both guards closed' },
    { id: 'rearGuardOpen', type: 'NC_CONTACT', position: { x: -220, y: 770 }, params: { address: '%IX0.7' }, label: 'Rear guard open' },
  );
  sheet.connections.push(
    { id: 'c6g1', from: { block: 'guardOk', port: 'Q' }, to: { block: 'guardsClosed', port: 'IN1' } },
    { id: 'c6g2', from: { block: 'rearGuardOk', port: 'Q' }, to: { block: 'guardsClosed', port: 'IN2' } },
    { id: 'c17b', from: { block: 'rearGuardOpen', port: 'Q' }, to: { block: 'yellowNeeded', port: 'IN3' } },
  );
  const c6 = sheet.connections.find((c) => c.id === 'c6');
  if (!c6) throw new Error('demo changeover: connection c6 is missing from the base cell');
  c6.from = { block: 'guardsClosed', port: 'Q' };
  const yellow = block('yellowNeeded');
  if (yellow.type !== 'OR') throw new Error('demo changeover: yellowNeeded is not an OR block');
  yellow.params.inputs = 3;
  p.initial.devices = { ...p.initial.devices, rearGuard: { guardClosed: true } };

  // 2. The digital-input card from slot 2 to slot 6 (rack 1).
  const card = p.controller.modules.find((m) => m.id === 'ctl-di');
  if (!card) throw new Error('demo changeover: controller module ctl-di is missing');
  card.slot = 6;
  for (const row of p.controller.pointMap) if (row.rack === 1 && row.slot === 2) row.slot = 6;
  for (const row of p.wiring) {
    for (const end of [row.from, row.to]) if ('controller' in end && end.controller.rack === 1 && end.controller.slot === 2) end.controller.slot = 6;
  }
  return cellDocumentSchema.parse(p);
}

/**
 * The demo lead's changeover, once (its own marker): version 2 of "Tallowmere line 3 rehearsal"
 * is the proposal above, and a changeover in drafting compares it with version 1 (what runs
 * today), with the plant's shift lead asked to countersign. The interlock rules and the two
 * scenarios of the cell come from the evidence seed. Uses the Knex it is given (runs under
 * tsx and vitest's global setup as well as the app). Returns false when it had already run.
 */
export async function seedDemoChangeovers(knex: Knex): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const lead = await trx('users').where({ email: 'lead@brennick.test' }).first('id');
    const cell = lead ? await trx('cells').where({ owner_id: lead.id, name: DEMO_CELL_NAMES.leadCopy }).whereNull('deleted_at').first('id') : undefined;
    // Without the demo lead's cell there is nothing to change over (and no marker, so a later run still seeds).
    if (!lead || !cell) return false;
    const inserted = await trx('seed_markers').insert({ name: MARKER }).onConflict('name').ignore().returning('name');
    if (inserted.length === 0) return false;

    const [countersigner] = await trx('users')
      .insert({
        email: DEMO_COUNTERSIGNER.email,
        name: DEMO_COUNTERSIGNER.name,
        role: DEMO_COUNTERSIGNER.role,
        organization: DEMO_COUNTERSIGNER.organization,
        password_hash: await hashPassword(DEMO_COUNTERSIGNER.password),
      })
      .onConflict('email')
      .merge(['name'])
      .returning('id');

    const versions = await trx('cell_versions').where({ cell_id: cell.id }).orderBy('version', 'desc').select('version', 'document');
    const base = versions.find((v) => v.version === 1);
    if (!base) return false;
    const proposal = demoChangeoverProposal(cellDocumentSchema.parse(base.document));
    const latest = versions[0].version as number;
    await trx('cell_versions').insert({
      cell_id: cell.id,
      version: latest + 1,
      document: JSON.stringify(proposal),
      author_id: lead.id,
      message: DEMO_CHANGEOVER.proposalMessage,
    });
    await trx('cells').where({ id: cell.id }).update({ updated_at: trx.fn.now() });
    const [co] = await trx('changeovers')
      .insert({
        cell_id: cell.id,
        title: DEMO_CHANGEOVER.title,
        description: DEMO_CHANGEOVER.description,
        opened_by: lead.id,
        base_version: 1,
        countersigner_id: countersigner.id,
      })
      .returning('id');
    await trx('changeover_events').insert([
      { changeover_id: co.id, kind: 'opened', actor_id: lead.id, detail: JSON.stringify({ baseVersion: 1 }) },
      { changeover_id: co.id, kind: 'countersigner', actor_id: lead.id, detail: JSON.stringify({ countersigner: { id: countersigner.id, name: DEMO_COUNTERSIGNER.name } }) },
    ]);
    return true;
  });
}
