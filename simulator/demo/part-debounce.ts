/**
 * The model fix for a chattering part-sensor input on the pick-and-place demo: the part
 * signal passes an off-delay (TOF) that rides through dropouts shorter than its preset, then
 * an on-delay (TON) that wants the held signal for a moment before it counts — a debounce in
 * both directions. Both the robot's part-present output (%QX0.5) and the start permission
 * read the debounced signal. Used by the chattering-sensor drill and its tests.
 */
import type { LogicSheetInput } from '@/simulator/plc/sheet-schema';
import { pickAndPlaceCell } from './pick-and-place';

/** Presets of the model fix, in ms: hold through dropouts up to 500 ms, then want 100 ms of part. */
export const PART_DEBOUNCE_MS = { holdOff: 500, settleOn: 100 } as const;

/**
 * The pick-and-place logic sheet with the part input debounced (see the file comment).
 * Returns a fresh copy each call.
 */
export function pickAndPlaceDebouncedSheet(): LogicSheetInput {
  const sheet = JSON.parse(JSON.stringify(pickAndPlaceCell.plc.sheet)) as LogicSheetInput;
  sheet.blocks.push(
    { id: 'partHold', type: 'TOF', position: { x: 160, y: 560 }, params: { PT: PART_DEBOUNCE_MS.holdOff } },
    { id: 'partSteady', type: 'TON', position: { x: 300, y: 560 }, params: { PT: PART_DEBOUNCE_MS.settleOn } },
  );
  sheet.connections = sheet.connections.filter((c) => c.id !== 'c2' && c.id !== 'c13');
  sheet.connections.push(
    { id: 'd1', from: { block: 'partPass', port: 'Q' }, to: { block: 'partHold', port: 'IN' } },
    { id: 'd2', from: { block: 'partHold', port: 'Q' }, to: { block: 'partSteady', port: 'IN' } },
    { id: 'd3', from: { block: 'partSteady', port: 'Q' }, to: { block: 'robotPart', port: 'IN' } },
    { id: 'd4', from: { block: 'partSteady', port: 'Q' }, to: { block: 'readyAndPart', port: 'IN2' } },
  );
  return sheet;
}
