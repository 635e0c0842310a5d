/**
 * Test documents for the diff: the pick-and-place demo cell (parsed, defaults applied) and a
 * changeover proposal made from it by hand, each edit one a maintenance lead might make.
 * Used by the diff tests only.
 */
import { cellDocumentSchema, type CellDocument } from '@/simulator/schema/cell-document';
import type { CellDocumentInput } from '@/simulator/demo';
import { pickAndPlaceCell } from '@/simulator/demo';

/** A demo cell as the schema parses it (a fresh copy each call). */
export function parsedCell(input: CellDocumentInput = pickAndPlaceCell): CellDocument {
  return cellDocumentSchema.parse(structuredClone(input));
}

/** Ids of the wiring rows that land on the controller's digital input card (rack 1, slot 2). */
export const INPUT_CARD_ROWS = ['w-estop2', 'l-start', 'l-stop', 'l-reset', 'l-guard', 'l-part', 'l-recipe'] as const;

/**
 * The changeover proposal for Kestrel Vale Cell B (invented):
 * 1. a second, rear guard door: guard switch `guard2` wired to %IX0.7, a contact `guard2Ok`
 *    and a fifth input on `startPermit` (connection `c6b`), starting closed;
 * 2. the controller's digital input card moved from slot 2 to slot 6 (rack 1): module, point-map rows
 *    `pm-di` and `pm-wi`, and every wire on that card;
 * 3. the start pulse lengthened: `startPulse` PT 100 → 150 ms;
 * 4. connection `c12` re-pointed: the guard passed to the robot now comes from `guardOk`;
 * 5. routine step 5 (wait for the gripper to close) timeout 2000 → 3000 ms;
 * 6. handshake role `guardClosed` re-pointed from DI4 to a new point DI7 "Guards closed",
 *    driven by %QX0.6 over a new link wire `l-guards`;
 * and the `recipeWord` block dragged on the canvas (a low-importance move).
 */
export function changeoverProposal(base: CellDocument): CellDocument {
  const p = structuredClone(base);
  // 1. second guard door
  p.field.push({ id: 'guard2', type: 'guard-switch', label: 'Rear guard', contact: 'NC' });
  p.wiring.push({ id: 'w-guard2', from: { device: 'guard2', terminal: 'contact' }, to: { plc: '%IX0.7' } });
  p.plc.sheet.blocks.push({ id: 'guard2Ok', type: 'NO_CONTACT', position: { x: 0, y: 90 }, params: { address: '%IX0.7' } });
  const permit = p.plc.sheet.blocks.find((b) => b.id === 'startPermit');
  if (permit?.type !== 'AND') throw new Error('fixture: startPermit is not an AND block');
  permit.params.inputs = 5;
  p.plc.sheet.connections.push({ id: 'c6b', from: { block: 'guard2Ok', port: 'Q' }, to: { block: 'startPermit', port: 'IN5' } });
  p.initial.devices = { ...p.initial.devices, guard2: { guardClosed: true } };
  // 2. input card to slot 6
  p.controller.modules.find((m) => m.id === 'ctl-di')!.slot = 6;
  for (const row of p.controller.pointMap) if (row.id === 'pm-di' || row.id === 'pm-wi') row.slot = 6;
  for (const row of p.wiring) {
    for (const end of [row.from, row.to]) if ('controller' in end && end.controller.slot === 2) end.controller.slot = 6;
  }
  // 3. start pulse
  const pulse = p.plc.sheet.blocks.find((b) => b.id === 'startPulse');
  if (pulse?.type !== 'TP') throw new Error('fixture: startPulse is not a TP block');
  pulse.params.PT = 150;
  // 4. re-pointed connection
  p.plc.sheet.connections.find((c) => c.id === 'c12')!.from = { block: 'guardOk', port: 'Q' };
  // 5. routine step 5 timeout
  const wait = p.controller.routine[4];
  if (wait.kind !== 'wait') throw new Error('fixture: step 5 is not a wait');
  wait.timeoutMs = 3000;
  // 6. handshake role on a new point DI7
  const di = p.controller.pointMap.find((r) => r.id === 'pm-di')!;
  di.count = 7;
  di.points = [...(di.points ?? []), { label: 'Guards closed' }];
  p.wiring.push({ id: 'l-guards', from: { plc: '%QX0.6' }, to: { controller: { rack: 1, slot: 6, channel: 6 } } });
  p.controller.handshake.inputs.guardClosed = 'DI7';
  // a canvas move
  p.plc.sheet.blocks.find((b) => b.id === 'recipeWord')!.position = { x: 640, y: 1000 };
  return p;
}
