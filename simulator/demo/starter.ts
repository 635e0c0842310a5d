/**
 * Demo cell (b): a panel-only starter exercise from "Kestrel Vale Technical College", an invented
 * school. A start/stop seal-in circuit lights a "Running" lamp; a speed potentiometer on a
 * 4–20 mA loop is scaled to 0–100 % and shown on a numeric display. No robot.
 */
import type { CellDocumentInput } from './pick-and-place';

const at = (x: number, y: number) => ({ x, y });

/** The panel-only starter exercise document. */
export const starterCell: CellDocumentInput = {
  schemaVersion: 2,
  id: 'kestrel-vale-starter',
  name: 'Kestrel Vale starter exercise — start/stop with seal-in',
  description:
    'Invented first exercise: wire an NO start and an NC stop button to the PLC, build a seal-in so the Running lamp stays lit, ' +
    'and show a 4–20 mA speed setpoint in percent.',
  seed: 7,
  panel: [
    { id: 'start', type: 'push-button', label: 'Start', colour: 'green', position: at(40, 60), contact: 'NO', action: 'momentary', function: 'start' },
    { id: 'stop', type: 'push-button', label: 'Stop', colour: 'red', position: at(160, 60), contact: 'NC', action: 'momentary', function: 'stop' },
    { id: 'estop', type: 'e-stop', label: 'Emergency stop', colour: 'red', position: at(280, 60) },
    { id: 'running', type: 'pilot-light', label: 'Running', colour: 'green', position: at(400, 60) },
    { id: 'speed', type: 'potentiometer', label: 'Speed setpoint', colour: 'black', position: at(40, 200), signal: '4-20mA', min: 0, max: 100, unit: '%' },
    { id: 'speedShown', type: 'numeric-display', label: 'Speed %', colour: 'black', position: at(160, 200), digits: 3, encoding: 'binary' },
  ],
  field: [],
  link: { kind: 'hardwired' },
  plc: {
    modules: [
      { id: 'di0', kind: 'digital-in', address: 0, channels: 8, wiring: 'sinking', inputType: 1 },
      { id: 'dq0', kind: 'digital-out', address: 0, channels: 8 },
      { id: 'dq2', kind: 'digital-out', address: 2, channels: 16 },
      { id: 'ai4', kind: 'analog-in', address: 4, channels: 2, signal: '4-20mA', resolutionBits: 12 },
    ],
    sheet: {
      scanPeriodMs: 10,
      blocks: [
        { id: 'startPB', type: 'NO_CONTACT', position: at(0, 0), params: { address: '%IX0.0' } },
        { id: 'sealIn', type: 'NO_CONTACT', position: at(0, 60), params: { address: '%QX0.0' } },
        { id: 'startOrSeal', type: 'OR', position: at(150, 30), params: { inputs: 2 } },
        { id: 'stopOk', type: 'NO_CONTACT', position: at(0, 120), params: { address: '%IX0.1' } },
        { id: 'estopOk', type: 'NO_CONTACT', position: at(0, 180), params: { address: '%IX0.2' } },
        { id: 'runPermit', type: 'AND', position: at(300, 90), params: { inputs: 3 } },
        { id: 'runCoil', type: 'COIL', position: at(450, 90), params: { address: '%QX0.0' } },
        { id: 'speedRaw', type: 'WORD_IN', position: at(0, 260), params: { address: '%IW4', signed: true } },
        // No raw span of its own: it takes the 12-bit analog module's 0..4095 (see plc.modules).
        { id: 'speedPct', type: 'SPAN_MAP', position: at(150, 260), params: { outMin: 0, outMax: 100, clamp: true } },
        { id: 'speedOut', type: 'WORD_OUT', position: at(300, 260), params: { address: '%QW2' } },
      ],
      connections: [
        { id: 'c1', from: { block: 'startPB', port: 'Q' }, to: { block: 'startOrSeal', port: 'IN1' } },
        { id: 'c2', from: { block: 'sealIn', port: 'Q' }, to: { block: 'startOrSeal', port: 'IN2' } },
        { id: 'c3', from: { block: 'startOrSeal', port: 'Q' }, to: { block: 'runPermit', port: 'IN1' } },
        { id: 'c4', from: { block: 'stopOk', port: 'Q' }, to: { block: 'runPermit', port: 'IN2' } },
        { id: 'c5', from: { block: 'estopOk', port: 'Q' }, to: { block: 'runPermit', port: 'IN3' } },
        { id: 'c6', from: { block: 'runPermit', port: 'Q' }, to: { block: 'runCoil', port: 'IN' } },
        { id: 'c7', from: { block: 'speedRaw', port: 'OUT' }, to: { block: 'speedPct', port: 'IN' } },
        { id: 'c8', from: { block: 'speedPct', port: 'OUT' }, to: { block: 'speedOut', port: 'IN' } },
      ],
    },
  },
  wiring: [
    { id: 'w-start', from: { device: 'start', terminal: 'contact' }, to: { plc: '%IX0.0' } },
    { id: 'w-stop', from: { device: 'stop', terminal: 'contact' }, to: { plc: '%IX0.1' } },
    { id: 'w-estop', from: { device: 'estop', terminal: 'contact' }, to: { plc: '%IX0.2' } },
    { id: 'w-running', from: { plc: '%QX0.0' }, to: { device: 'running', terminal: 'lamp' } },
    { id: 'w-speed', from: { device: 'speed', terminal: 'signal' }, to: { plc: '%IW4' } },
    { id: 'w-display', from: { plc: '%QW2' }, to: { device: 'speedShown', terminal: 'value' } },
  ],
  controller: {
    axes: 1,
    bootMs: 0,
    ioRefreshMs: 10,
    stopCategory: 0,
    homePose: 'home',
    positionTolerance: 0.001,
    cycleDonePulseMs: 0,
    modules: [],
    pointMap: [],
    staged: null,
    handshake: { inputs: {}, outputs: {} },
    routine: [],
    poses: [{ id: 'home', coordinates: [0], speed: 1, accel: 1 }],
  },
  initial: { controllerPowered: false, devices: { speed: { value: 0 } } },
};
