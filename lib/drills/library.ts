/**
 * The built-in drill library: invented fault-finding exercises on the demo cells. Each names
 * its base document (the pick-and-place demo, or a variant of it built here through the
 * engine's document schema), its hidden fault cards, brief, objectives, weighted rules and the
 * answer. No `server-only`: the demo seed (tsx, vitest global setup) imports it.
 *
 * Scenarios are invented; the behaviour they rely on is the engine's (docs/engine.md) and
 * common practice: NC stop circuits read "stop" on a broken wire; a sinking input needs a
 * sourcing (PNP) sensor; NE 43 treats a 4–20 mA loop below 3.6 mA as failed; a chattering
 * input is debounced with timers (the chattering-sensor drill grades the fix through the
 * student's `download` of the logic sheet — simulator/demo/part-debounce.ts is a model fix).
 */
import { pickAndPlaceCell, type FaultCard } from '@/simulator';

type CellDocumentInput = typeof pickAndPlaceCell;
import type { DrillInput, WeightedRule } from '@/lib/schemas/drills';

/** Base documents the library needs besides the plain demo cell. */
export type LibraryBase = 'pick-and-place' | 'staged-restart' | 'recipe-encoding' | 'air-pressure';

export interface LibraryDrill {
  key: string;
  base: LibraryBase;
  input: Omit<DrillInput, 'cellId' | 'cellVersion'>;
}

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

/** Names of the variant cells the seed creates for the drills that need them. */
export const LIBRARY_BASE_NAMES: Record<Exclude<LibraryBase, 'pick-and-place'>, string> = {
  'staged-restart': 'Drill base — Cell B after the I/O card move',
  'recipe-encoding': 'Drill base — Cell B with the new recipe selector',
  'air-pressure': 'Drill base — Cell B with supply air monitoring',
};

/**
 * The variant documents. staged-restart: the digital-input row was moved one channel up
 * (points count from 1, channels from 0 — the classic slip) and the correction was staged but
 * the controller never restarted. recipe-encoding: the recipe word is read as Gray code while the PLC
 * sends binary. air-pressure: a 4–20 mA supply-air transmitter (modelled with the engine's
 * analog dial device) on a new analog input module at %IW4.
 */
export function libraryBaseDocument(base: LibraryBase): CellDocumentInput {
  const doc = clone(pickAndPlaceCell);
  if (base === 'staged-restart') {
    const rows = doc.controller.pointMap;
    const di = rows.find((r) => r.id === 'pm-di')!;
    doc.controller.staged = clone(rows);
    di.firstChannel = 1;
    doc.id = 'kestrel-vale-cell-b-staged';
    doc.name = LIBRARY_BASE_NAMES['staged-restart'];
  } else if (base === 'recipe-encoding') {
    doc.controller.pointMap.find((r) => r.id === 'pm-wi')!.encoding = 'gray';
    doc.id = 'kestrel-vale-cell-b-recipe-encoding';
    doc.name = LIBRARY_BASE_NAMES['recipe-encoding'];
  } else if (base === 'air-pressure') {
    doc.panel.push({
      id: 'airPressure',
      type: 'potentiometer',
      label: 'Supply air pressure transmitter (simulated)',
      colour: 'black',
      position: { x: 40, y: 200 },
      signal: '4-20mA',
      min: 0,
      max: 10,
      unit: 'bar',
    });
    doc.plc.modules.push({ id: 'plc-ai4', kind: 'analog-in', address: 4, channels: 1, signal: '4-20mA', resolutionBits: 12 });
    doc.wiring.push({ id: 'w-air', from: { device: 'airPressure', terminal: 'signal' }, to: { plc: '%IW4' }, label: 'Supply air 4–20 mA' });
    doc.initial = { ...doc.initial!, devices: { ...(doc.initial?.devices ?? {}), airPressure: { value: 6 } } };
    doc.id = 'kestrel-vale-cell-b-air';
    doc.name = LIBRARY_BASE_NAMES['air-pressure'];
  }
  return doc;
}

const GUARD_RULE: WeightedRule = {
  weight: 3,
  rule: {
    id: 'no-motion-guard-open',
    kind: 'after',
    label: 'The arm is at rest within 600 ms of the guard reading open',
    event: { signal: 'plc.%IX0.4', op: '==', value: 0 },
    withinMs: 600,
    p: { signal: 'arm.moving', op: '==', value: 0 },
  },
};

const ESTOP_RULE: WeightedRule = {
  weight: 2,
  rule: {
    id: 'estop-stops',
    kind: 'after',
    label: 'Within 1 s of the e-stop the arm is at rest with the servos off',
    event: { signal: 'dev.estop.latched', op: '==', value: 1 },
    withinMs: 1000,
    p: { all: [{ signal: 'arm.moving', op: '==', value: 0 }, { signal: 'ctl.servo', op: '==', value: 0 }] },
  },
};

const TEN_MIN = 600_000;
const READ_ONLY = { forceAllowed: true, editable: [] as ('point-map' | 'logic' | 'wiring' | 'routine')[] };

function card(c: FaultCard): FaultCard {
  return c;
}

/** Every built-in drill, in the order a course would take them. */
export const DRILL_LIBRARY: readonly LibraryDrill[] = [
  {
    key: 'nc-stop-broken-wire',
    base: 'pick-and-place',
    input: {
      title: 'Cell B holds for no reason',
      brief: `## Night shift report\n\nCell B at Kestrel Vale ran fine at the start of the shift. Then the robot went to hold mid-cycle and now refuses to start; the yellow lamp is lit. Nobody touched the stop button.\n\nFind the cause with the monitor, the meter readings on the terminal strip and the scope. Do not bypass anything you cannot explain.`,
      faults: [card({ id: 'f1', kind: 'open-wire', row: 'w-stop', at: 15_000, label: 'Stop circuit conductor broken in the cable chain' })],
      objectives: ['Run the cell and watch what happens when the robot holds.', 'Compare the stop button with what the PLC input reads.', 'Name the fault and the terminal-strip row.'],
      rules: [GUARD_RULE, ESTOP_RULE],
      answer: { kind: 'open-wire', location: 'w-stop' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: READ_ONLY,
    },
  },
  {
    key: 'part-sensor-type',
    base: 'pick-and-place',
    input: {
      title: 'The new part sensor lights but nothing happens',
      brief: `## After the sensor swap\n\nMaintenance replaced the part sensor at the pick station from the stores. Its LED lights when a part is there, but the robot waits for a part forever ("No part at the pick station").\n\nThe PLC's input card is a sinking card. Find out why the input never turns on.`,
      faults: [card({ id: 'f1', kind: 'sensor-type-mismatch', device: 'part', label: 'NPN sensor fitted where a PNP one belongs' })],
      objectives: ['Put a part at the pick station and compare the sensor LED with the PLC input.', 'Check the input card type against the sensor output type.', 'Name the fault and the device.'],
      rules: [GUARD_RULE],
      answer: { kind: 'sensor-type-mismatch', location: 'part|w-part' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: READ_ONLY,
    },
  },
  {
    key: 'swapped-start-reset',
    base: 'pick-and-place',
    input: {
      title: 'Start resets, reset starts',
      brief: `## After the panel rewire\n\nThe operator panel of Cell B was taken off its hinges for a repaint and wired back up. Since then the buttons "do strange things".\n\nWork out what is going on from the inputs and the robot's behaviour.`,
      faults: [card({ id: 'f1', kind: 'swapped-wires', rows: ['w-start', 'w-reset'], label: 'Start and fault-reset conductors landed on each other\'s terminals' })],
      objectives: ['Press each panel button and note which PLC input follows it.', 'Name the fault and both terminal-strip rows.'],
      rules: [GUARD_RULE, ESTOP_RULE],
      answer: { kind: 'swapped-wires', location: 'w-start,w-reset' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: READ_ONLY,
    },
  },
  {
    key: 'staged-restart-forgotten',
    base: 'staged-restart',
    input: {
      title: 'The I/O card move that never took effect',
      brief: `## Change left half done\n\nLast week the controller's digital-input range was moved and a correction was entered afterwards. The robot still reacts to the wrong buttons: start does nothing, and it reports a stop request that nobody made.\n\nFind out why the correction is not in effect, put it in effect, and run one full cycle.`,
      faults: [],
      objectives: ['Compare the live point map with the staged one.', 'Bring the correction into effect.', 'Complete one full cycle.', 'Name the fault and the point-map row.'],
      rules: [
        GUARD_RULE,
        { weight: 5, rule: { id: 'one-cycle', kind: 'eventually', withinMs: TEN_MIN, label: 'At least one complete cycle', p: { signal: 'ctl.cycles', op: '>=', value: 1 } } },
      ],
      answer: { kind: 'staged-not-applied', location: 'pm-di' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: { forceAllowed: true, editable: ['point-map'] },
    },
  },
  {
    key: 'recipe-word-encoding',
    base: 'recipe-encoding',
    input: {
      title: 'Recipe 2 parts land on place 1',
      brief: `## Wrong place\n\nSince the controller's recipe input was reconfigured, parts for recipe 2 end up at place 1. Recipe 1 still works.\n\nFind the cause from the recipe word's bits and what the controller makes of them, correct it, and place one recipe-2 part at place 2.`,
      faults: [],
      objectives: ['Select recipe 2 and read the recipe word bits and the value the controller decodes.', 'Correct the configuration (a controller restart applies point-map changes).', 'Place one part at place 2.', 'Name the fault and the point-map row.'],
      rules: [
        GUARD_RULE,
        {
          weight: 5,
          rule: {
            id: 'reached-place-2',
            kind: 'eventually',
            withinMs: TEN_MIN,
            label: 'The arm reaches place 2',
            p: { all: [{ signal: 'arm.0', op: '<=', value: -0.39 }, { signal: 'arm.1', op: '>=', value: 0.34 }] },
          },
        },
      ],
      answer: { kind: 'wrong-word-encoding', location: 'pm-wi' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: { forceAllowed: true, editable: ['point-map'] },
    },
  },
  {
    key: 'chattering-part-sensor',
    base: 'pick-and-place',
    input: {
      title: 'Ghost parts at the pick station',
      brief: `## Intermittent\n\nOperators say the part-present lamp flickers and the robot sometimes starts for a part that is not there yet — or stops waiting for one that is. The sensor looks fine and steady.\n\nCapture the input on the scope and name the fault and where it is. Until maintenance can re-terminate the wire, debounce the part signal in the logic sheet (the robot's part-present output %QX0.5 and the start permission should only see a steady part) and send the sheet to the cell (Send to cell). Take the part off the sensor first: sending restarts the PLC logic, and its outputs drop for a moment.\n\n> A software workaround for a hardware fault is a change to a running machine. In a real plant it goes through the site's change procedure (management of change: a review of what it hides, approval, a record, and a date to take it out once the wire is repaired) before anyone sends it to the PLC, and local codes and licensed practice take precedence. Here it is an exercise on a simulated cell.`,
      faults: [card({ id: 'f1', kind: 'chatter', row: 'w-part', periodMs: 30, probability: 0.35, label: 'Loose terminal on the part-sensor input' })],
      objectives: [
        'Put the part sensor on the scope and compare it with the device.',
        'Name the fault and the row.',
        'Debounce the part signal in the logic sheet (timer blocks and presets of your choice) and send it to the cell.',
        'Show the fix: put a part on the sensor, run one full cycle, then take the part off.',
      ],
      rules: [
        GUARD_RULE,
        {
          weight: 5,
          rule: {
            id: 'part-signal-steady',
            kind: 'never',
            // The robot reads %QX0.5 as DI6 one I/O refresh later; so "DI6 still on, %QX0.5 off, part still there" is the
            // moment the PLC withdraws the part from the robot while the part has not moved: a dropout of the signal.
            label: 'The robot never sees the part signal drop while the part is still there',
            p: {
              all: [
                { signal: 'dev.part.active', op: '==', value: 1 },
                { signal: 'ctl.DI6', op: '==', value: 1 },
                { signal: 'plc.%QX0.5', op: '==', value: 0 },
              ],
            },
          },
        },
        {
          weight: 2,
          rule: {
            id: 'part-signal-on',
            kind: 'after',
            label: 'Within 1 s of a part arriving, the robot gets the part signal',
            event: { signal: 'dev.part.active', op: '==', value: 1 },
            withinMs: 1000,
            p: { signal: 'plc.%QX0.5', op: '==', value: 1 },
          },
        },
        {
          weight: 2,
          rule: {
            id: 'part-signal-off',
            kind: 'after',
            label: 'Within 1 s of the part leaving, the robot loses the part signal',
            event: { signal: 'dev.part.active', op: '==', value: 0 },
            withinMs: 1000,
            p: { signal: 'plc.%QX0.5', op: '==', value: 0 },
          },
        },
        { weight: 3, rule: { id: 'cycle-with-part', kind: 'eventually', withinMs: TEN_MIN, label: 'The cell completes a cycle (with a part on the sensor)', p: { signal: 'ctl.cycles', op: '>=', value: 1 } } },
      ],
      answer: { kind: 'chatter', location: 'w-part|part' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: { forceAllowed: true, editable: ['logic'] },
    },
  },
  {
    key: 'air-pressure-lost',
    base: 'air-pressure',
    input: {
      title: 'Supply air reading dropped out',
      brief: `## Pressure alarm\n\nCell B now monitors its supply air with a 4–20 mA transmitter on a new analog input. Twenty seconds into the shift the reading fell to nothing, although the gauge on the regulator still shows about 6 bar.\n\nMeasure the loop, decide whether the air or the signal is lost, and say where.`,
      faults: [card({ id: 'f1', kind: 'analog-loss', device: 'airPressure', at: 20_000, label: 'Transmitter loop interrupted at the junction box' })],
      objectives: ['Read the loop current on the terminal strip before and after the drop.', 'Classify the loop against the NAMUR NE 43 bands.', 'Name the fault and where it is.'],
      rules: [GUARD_RULE],
      answer: { kind: 'analog-loss', location: 'airPressure|w-air' },
      diagnosisWeight: 10,
      timeLimitMs: TEN_MIN,
      permissions: READ_ONLY,
    },
  },
];

/** The drill the demo seed assigns to the demo cohort. */
export const DEMO_ASSIGNED_DRILL = 'nc-stop-broken-wire';
