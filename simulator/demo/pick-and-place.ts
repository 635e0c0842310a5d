/**
 * Demo cell (a): the pick-and-place trainer of "Cell B" at Kestrel Vale Technical College, an
 * invented school. A 2-axis arm picks a part from the pick station and sets it down at one of
 * two places chosen by a recipe number; the PLC gates the robot with the usual interlocks.
 *
 * Interlocks modelled (a training model, not a safety function):
 * - e-stop: a two-channel NC e-stop; channel 1 to the PLC, channel 2 straight to the
 *   controller's e-stop-chain input, so a broken chain stops the arm whatever the PLC does;
 * - guard: an NC guard switch; the PLC passes "guard closed" to the controller, which holds
 *   motion while it is off and refuses to start;
 * - start: the PLC turns the start button's rising edge (R_TRIG) into a 100 ms pulse (TP, long
 *   enough for the controller's 20 ms refresh to see) only with the guard closed, the e-stop
 *   chain healthy, and either the robot ready with a part present or the robot holding
 *   mid-cycle. Because only the edge counts, a start button held through an e-stop reset
 *   does not start the robot when it becomes ready (ISO 13850: reset must not restart);
 * - stop: an NC stop button; pressing it (or a broken wire) asks the robot to hold.
 */
import type { z } from 'zod';
import type { cellDocumentSchema } from '@/simulator/schema/cell-document';

/** A cell document as written (defaults may be omitted). */
export type CellDocumentInput = z.input<typeof cellDocumentSchema>;

const at = (x: number, y: number) => ({ x, y });
let px = 0;
const pos = () => at(40 + 120 * (px++ % 6), 60);

/** The pick-and-place demo cell document. */
export const pickAndPlaceCell: CellDocumentInput = {
  schemaVersion: 2,
  id: 'kestrel-vale-cell-b',
  name: 'Kestrel Vale Cell B — pick and place',
  description:
    'Invented trainer cell: a 2-axis arm moves parts from the pick station to place 1 or place 2 (recipe number 1 or 2). ' +
    'Start, NC stop, two-channel NC e-stop, guard switch, part sensor, gripper with feedback, stack light.',
  seed: 20260301,
  panel: [
    { id: 'start', type: 'push-button', label: 'Cycle start', colour: 'green', position: pos(), contact: 'NO', action: 'momentary', function: 'start' },
    { id: 'stop', type: 'push-button', label: 'Cycle stop', colour: 'red', position: pos(), contact: 'NC', action: 'momentary', function: 'stop' },
    { id: 'reset', type: 'push-button', label: 'Fault reset', colour: 'blue', position: pos(), contact: 'NO', action: 'momentary', function: 'reset' },
    { id: 'estop', type: 'e-stop', label: 'Emergency stop', colour: 'red', position: pos() },
    { id: 'recipe', type: 'selector-switch', label: 'Recipe', colour: 'black', position: pos(), positions: ['Recipe 1', 'Recipe 2'] },
    { id: 'readyLamp', type: 'pilot-light', label: 'Robot ready', colour: 'white', position: pos() },
    { id: 'stack', type: 'stack-light', label: 'Cell status', colour: 'grey', position: at(760, 20), tiers: ['red', 'yellow', 'green'] },
  ],
  field: [
    { id: 'guard', type: 'guard-switch', label: 'Front guard', contact: 'NC' },
    { id: 'part', type: 'part-sensor', label: 'Part at pick station', output: 'PNP' },
    { id: 'gripper', type: 'gripper', label: 'Parallel gripper', travelMs: 300 },
  ],
  link: { kind: 'hardwired' },
  plc: {
    modules: [
      { id: 'plc-di0', kind: 'digital-in', address: 0, channels: 16, wiring: 'sinking', inputType: 1 },
      { id: 'plc-dq0', kind: 'digital-out', address: 0, channels: 16 },
      { id: 'plc-dq2', kind: 'digital-out', address: 2, channels: 8 },
    ],
    sheet: {
      scanPeriodMs: 10,
      blocks: [
        { id: 'startPB', type: 'NO_CONTACT', position: at(0, 0), params: { address: '%IX0.0' } },
        { id: 'guardOk', type: 'NO_CONTACT', position: at(0, 60), params: { address: '%IX0.4' } },
        { id: 'estopOk', type: 'NO_CONTACT', position: at(0, 120), params: { address: '%IX0.2' } },
        { id: 'partOk', type: 'NO_CONTACT', position: at(0, 180), params: { address: '%IX0.5' } },
        { id: 'robotReady', type: 'NO_CONTACT', position: at(0, 240), params: { address: '%IX1.0' } },
        { id: 'robotCycling', type: 'NO_CONTACT', position: at(0, 300), params: { address: '%IX1.2' } },
        { id: 'readyAndPart', type: 'AND', position: at(160, 210), params: { inputs: 2 } },
        { id: 'mayStart', type: 'OR', position: at(300, 240), params: { inputs: 2 } },
        { id: 'startEdge', type: 'R_TRIG', position: at(160, 0), params: {} },
        { id: 'startPermit', type: 'AND', position: at(440, 60), params: { inputs: 4 } },
        { id: 'startPulse', type: 'TP', position: at(520, 60), params: { PT: 100 } },
        { id: 'robotStart', type: 'COIL', position: at(600, 60), params: { address: '%QX0.0' } },
        { id: 'stopPressed', type: 'NC_CONTACT', position: at(0, 380), params: { address: '%IX0.1' } },
        { id: 'robotStop', type: 'COIL', position: at(600, 380), params: { address: '%QX0.1' } },
        { id: 'resetPB', type: 'NO_CONTACT', position: at(0, 440), params: { address: '%IX0.3' } },
        { id: 'robotReset', type: 'COIL', position: at(600, 440), params: { address: '%QX0.2' } },
        { id: 'guardPass', type: 'NO_CONTACT', position: at(0, 500), params: { address: '%IX0.4' } },
        { id: 'robotGuard', type: 'COIL', position: at(600, 500), params: { address: '%QX0.3' } },
        { id: 'partPass', type: 'NO_CONTACT', position: at(0, 560), params: { address: '%IX0.5' } },
        { id: 'robotPart', type: 'COIL', position: at(600, 560), params: { address: '%QX0.5' } },
        { id: 'robotFault', type: 'NO_CONTACT', position: at(0, 620), params: { address: '%IX1.6' } },
        { id: 'estopOpen', type: 'NC_CONTACT', position: at(0, 680), params: { address: '%IX0.2' } },
        { id: 'redNeeded', type: 'OR', position: at(300, 650), params: { inputs: 2 } },
        { id: 'stackRed', type: 'COIL', position: at(600, 650), params: { address: '%QX1.0' } },
        { id: 'guardOpen', type: 'NC_CONTACT', position: at(0, 740), params: { address: '%IX0.4' } },
        { id: 'stopHeld', type: 'NC_CONTACT', position: at(0, 800), params: { address: '%IX0.1' } },
        { id: 'yellowNeeded', type: 'OR', position: at(300, 770), params: { inputs: 2 } },
        { id: 'stackYellow', type: 'COIL', position: at(600, 770), params: { address: '%QX1.1' } },
        { id: 'cyclingLamp', type: 'NO_CONTACT', position: at(0, 860), params: { address: '%IX1.2' } },
        { id: 'stackGreen', type: 'COIL', position: at(600, 860), params: { address: '%QX1.2' } },
        { id: 'readyPass', type: 'NO_CONTACT', position: at(0, 920), params: { address: '%IX1.0' } },
        { id: 'readyLampCoil', type: 'COIL', position: at(600, 920), params: { address: '%QX1.3' } },
        { id: 'recipe2Selected', type: 'NO_CONTACT', position: at(0, 980), params: { address: '%IX0.6' } },
        { id: 'recipeOne', type: 'CONST', position: at(160, 1000), params: { value: 1 } },
        { id: 'recipeTwo', type: 'CONST', position: at(160, 1060), params: { value: 2 } },
        { id: 'recipeSelect', type: 'SEL', position: at(300, 1000), params: {} },
        { id: 'recipeWord', type: 'WORD_OUT', position: at(600, 1000), params: { address: '%QW2' } },
      ],
      connections: [
        { id: 'c1', from: { block: 'robotReady', port: 'Q' }, to: { block: 'readyAndPart', port: 'IN1' } },
        { id: 'c2', from: { block: 'partOk', port: 'Q' }, to: { block: 'readyAndPart', port: 'IN2' } },
        { id: 'c3', from: { block: 'readyAndPart', port: 'Q' }, to: { block: 'mayStart', port: 'IN1' } },
        { id: 'c4', from: { block: 'robotCycling', port: 'Q' }, to: { block: 'mayStart', port: 'IN2' } },
        { id: 'c5a', from: { block: 'startPB', port: 'Q' }, to: { block: 'startEdge', port: 'CLK' } },
        { id: 'c5', from: { block: 'startEdge', port: 'Q' }, to: { block: 'startPermit', port: 'IN1' } },
        { id: 'c6', from: { block: 'guardOk', port: 'Q' }, to: { block: 'startPermit', port: 'IN2' } },
        { id: 'c7', from: { block: 'estopOk', port: 'Q' }, to: { block: 'startPermit', port: 'IN3' } },
        { id: 'c8', from: { block: 'mayStart', port: 'Q' }, to: { block: 'startPermit', port: 'IN4' } },
        { id: 'c9a', from: { block: 'startPermit', port: 'Q' }, to: { block: 'startPulse', port: 'IN' } },
        { id: 'c9', from: { block: 'startPulse', port: 'Q' }, to: { block: 'robotStart', port: 'IN' } },
        { id: 'c10', from: { block: 'stopPressed', port: 'Q' }, to: { block: 'robotStop', port: 'IN' } },
        { id: 'c11', from: { block: 'resetPB', port: 'Q' }, to: { block: 'robotReset', port: 'IN' } },
        { id: 'c12', from: { block: 'guardPass', port: 'Q' }, to: { block: 'robotGuard', port: 'IN' } },
        { id: 'c13', from: { block: 'partPass', port: 'Q' }, to: { block: 'robotPart', port: 'IN' } },
        { id: 'c14', from: { block: 'robotFault', port: 'Q' }, to: { block: 'redNeeded', port: 'IN1' } },
        { id: 'c15', from: { block: 'estopOpen', port: 'Q' }, to: { block: 'redNeeded', port: 'IN2' } },
        { id: 'c16', from: { block: 'redNeeded', port: 'Q' }, to: { block: 'stackRed', port: 'IN' } },
        { id: 'c17', from: { block: 'guardOpen', port: 'Q' }, to: { block: 'yellowNeeded', port: 'IN1' } },
        { id: 'c18', from: { block: 'stopHeld', port: 'Q' }, to: { block: 'yellowNeeded', port: 'IN2' } },
        { id: 'c19', from: { block: 'yellowNeeded', port: 'Q' }, to: { block: 'stackYellow', port: 'IN' } },
        { id: 'c20', from: { block: 'cyclingLamp', port: 'Q' }, to: { block: 'stackGreen', port: 'IN' } },
        { id: 'c21', from: { block: 'readyPass', port: 'Q' }, to: { block: 'readyLampCoil', port: 'IN' } },
        { id: 'c22', from: { block: 'recipe2Selected', port: 'Q' }, to: { block: 'recipeSelect', port: 'G' } },
        { id: 'c23', from: { block: 'recipeOne', port: 'OUT' }, to: { block: 'recipeSelect', port: 'IN0' } },
        { id: 'c24', from: { block: 'recipeTwo', port: 'OUT' }, to: { block: 'recipeSelect', port: 'IN1' } },
        { id: 'c25', from: { block: 'recipeSelect', port: 'OUT' }, to: { block: 'recipeWord', port: 'IN' } },
      ],
    },
  },
  wiring: [
    { id: 'w-start', from: { device: 'start', terminal: 'contact' }, to: { plc: '%IX0.0' } },
    { id: 'w-stop', from: { device: 'stop', terminal: 'contact' }, to: { plc: '%IX0.1' } },
    { id: 'w-estop1', from: { device: 'estop', terminal: 'contact' }, to: { plc: '%IX0.2' } },
    { id: 'w-reset', from: { device: 'reset', terminal: 'contact' }, to: { plc: '%IX0.3' } },
    { id: 'w-guard', from: { device: 'guard', terminal: 'contact' }, to: { plc: '%IX0.4' } },
    { id: 'w-part', from: { device: 'part', terminal: 'out' }, to: { plc: '%IX0.5' } },
    { id: 'w-recipe2', from: { device: 'recipe', terminal: 'pos1' }, to: { plc: '%IX0.6' } },
    { id: 'w-estop2', from: { device: 'estop', terminal: 'contact' }, to: { controller: { rack: 1, slot: 2, channel: 4 } } },
    { id: 'l-start', from: { plc: '%QX0.0' }, to: { controller: { rack: 1, slot: 2, channel: 0 } } },
    { id: 'l-stop', from: { plc: '%QX0.1' }, to: { controller: { rack: 1, slot: 2, channel: 1 } } },
    { id: 'l-reset', from: { plc: '%QX0.2' }, to: { controller: { rack: 1, slot: 2, channel: 2 } } },
    { id: 'l-guard', from: { plc: '%QX0.3' }, to: { controller: { rack: 1, slot: 2, channel: 3 } } },
    { id: 'l-part', from: { plc: '%QX0.5' }, to: { controller: { rack: 1, slot: 2, channel: 5 } } },
    { id: 'l-recipe', from: { plc: '%QW2' }, to: { controller: { rack: 1, slot: 2, channel: 8 } }, bits: 4 },
    { id: 'l-ready', from: { controller: { rack: 1, slot: 3, channel: 0 } }, to: { plc: '%IX1.0' } },
    { id: 'l-home', from: { controller: { rack: 1, slot: 3, channel: 1 } }, to: { plc: '%IX1.1' } },
    { id: 'l-cycling', from: { controller: { rack: 1, slot: 3, channel: 2 } }, to: { plc: '%IX1.2' } },
    { id: 'l-atpos', from: { controller: { rack: 1, slot: 3, channel: 3 } }, to: { plc: '%IX1.3' } },
    { id: 'l-held', from: { controller: { rack: 1, slot: 3, channel: 4 } }, to: { plc: '%IX1.4' } },
    { id: 'l-done', from: { controller: { rack: 1, slot: 3, channel: 5 } }, to: { plc: '%IX1.5' } },
    { id: 'l-fault', from: { controller: { rack: 1, slot: 3, channel: 6 } }, to: { plc: '%IX1.6' } },
    { id: 'w-red', from: { plc: '%QX1.0' }, to: { device: 'stack', terminal: 'tier0' } },
    { id: 'w-yellow', from: { plc: '%QX1.1' }, to: { device: 'stack', terminal: 'tier1' } },
    { id: 'w-green', from: { plc: '%QX1.2' }, to: { device: 'stack', terminal: 'tier2' } },
    { id: 'w-readylamp', from: { plc: '%QX1.3' }, to: { device: 'readyLamp', terminal: 'lamp' } },
    { id: 't-close', from: { controller: { rack: 1, slot: 4, channel: 0 } }, to: { device: 'gripper', terminal: 'close' } },
    { id: 't-closed', from: { device: 'gripper', terminal: 'closed' }, to: { controller: { rack: 1, slot: 5, channel: 0 } } },
    { id: 't-open', from: { device: 'gripper', terminal: 'open' }, to: { controller: { rack: 1, slot: 5, channel: 1 } } },
  ],
  controller: {
    axes: 2,
    bootMs: 1500,
    ioRefreshMs: 20,
    stopCategory: 1,
    homePose: 'home',
    positionTolerance: 0.001,
    cycleDonePulseMs: 500,
    modules: [
      { id: 'ctl-di', rack: 1, slot: 2, type: 'digital-in', channels: 16 },
      { id: 'ctl-do', rack: 1, slot: 3, type: 'digital-out', channels: 16 },
      { id: 'ctl-to', rack: 1, slot: 4, type: 'tool-out', channels: 2 },
      { id: 'ctl-ti', rack: 1, slot: 5, type: 'tool-in', channels: 2 },
    ],
    pointMap: [
      {
        id: 'pm-di',
        family: 'DI',
        first: 1,
        count: 6,
        rack: 1,
        slot: 2,
        firstChannel: 0,
        points: [{ label: 'Start' }, { label: 'Stop request' }, { label: 'Fault reset' }, { label: 'Guard closed' }, { label: 'E-stop chain healthy' }, { label: 'Part present' }],
      },
      { id: 'pm-wi', family: 'WI', first: 1, count: 1, rack: 1, slot: 2, firstChannel: 8, bits: 4, encoding: 'binary', points: [{ label: 'Recipe number' }] },
      {
        id: 'pm-do',
        family: 'DO',
        first: 1,
        count: 7,
        rack: 1,
        slot: 3,
        firstChannel: 0,
        points: [{ label: 'Ready' }, { label: 'At home' }, { label: 'Cycling' }, { label: 'At position' }, { label: 'Part held' }, { label: 'Cycle done' }, { label: 'Fault' }],
      },
      { id: 'pm-to', family: 'TO', first: 1, count: 1, rack: 1, slot: 4, firstChannel: 0, points: [{ label: 'Gripper close' }] },
      { id: 'pm-ti', family: 'TI', first: 1, count: 2, rack: 1, slot: 5, firstChannel: 0, points: [{ label: 'Gripper closed' }, { label: 'Gripper open' }] },
    ],
    staged: null,
    handshake: {
      inputs: { start: 'DI1', stop: 'DI2', faultReset: 'DI3', guardClosed: 'DI4', estopHealthy: 'DI5', partPresent: 'DI6', recipe: 'WI1', partHeld: 'TI1' },
      outputs: { ready: 'DO1', atHome: 'DO2', cycling: 'DO3', atPosition: 'DO4', partHeld: 'DO5', cycleDone: 'DO6', fault: 'DO7' },
    },
    routine: [
      { kind: 'wait', condition: { point: 'DI6', op: '==', value: 1 }, timeoutMs: 10000, alarm: 'No part at the pick station' },
      { kind: 'move', pose: 'abovePick' },
      { kind: 'move', pose: 'pick' },
      { kind: 'set', point: 'TO1', value: 1 },
      { kind: 'wait', condition: { point: 'TI1', op: '==', value: 1 }, timeoutMs: 2000, alarm: 'Gripper did not close' },
      { kind: 'move', pose: 'abovePick' },
      { kind: 'branch', condition: { point: 'WI1', op: '==', value: 2 }, to: 'toPlace2' },
      { kind: 'move', pose: 'place1' },
      { kind: 'jump', to: 'release' },
      { kind: 'move', pose: 'place2', label: 'toPlace2' },
      { kind: 'set', point: 'TO1', value: 0, label: 'release' },
      { kind: 'wait', condition: { point: 'TI2', op: '==', value: 1 }, timeoutMs: 2000, alarm: 'Gripper did not open' },
      { kind: 'move', pose: 'home' },
    ],
    poses: [
      { id: 'home', label: 'Home', coordinates: [0, 0.4], speed: 0.5, accel: 1 },
      { id: 'abovePick', label: 'Above pick', coordinates: [0.5, 0.3], speed: 0.5, accel: 1 },
      { id: 'pick', label: 'Pick', coordinates: [0.5, 0.1], speed: 0.2, accel: 1 },
      { id: 'place1', label: 'Place 1', coordinates: [-0.4, 0.2], speed: 0.5, accel: 1 },
      { id: 'place2', label: 'Place 2', coordinates: [-0.4, 0.35], speed: 0.5, accel: 1 },
    ],
  },
  initial: { controllerPowered: true, devices: { guard: { guardClosed: true }, part: { partPresent: false } } },
};
