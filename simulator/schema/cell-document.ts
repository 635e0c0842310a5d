/**
 * The cell document: one JSON value that describes a whole cell (panel, field devices,
 * wiring, link, PLC, controller, routine, initial state). The zod schema checks shape and
 * ranges; `validateCellDocument` (validate.ts) adds the cross-reference checks.
 */
import { z } from 'zod';
import { logicSheetSchema } from '@/simulator/plc/sheet-schema';
import { parseAddressCached } from '@/simulator/address/address';
import { CELL_LIMITS as L } from './limits';

/**
 * Current schema version. Older documents are brought up to it by `upgradeCellDocument`
 * (upgrade.ts) before they are parsed; any other version is rejected with a path.
 * 2: the handshake input role `job` is called `recipe`.
 */
export const CELL_SCHEMA_VERSION = 2 as const;

const idSchema = z
  .string()
  .min(1)
  .max(L.idLength)
  .regex(/^[A-Za-z][A-Za-z0-9_.-]*$/, 'ids start with a letter and use letters, digits, _ . -');
const textSchema = z.string().max(L.textLength);
const durationMs = z.number().int().min(0).max(L.durationMs);
const periodMs = z.number().int().min(1).max(L.periodMs);
const coordinate = z.number().min(-L.coordinate).max(L.coordinate);

/**
 * Indicator and push-button colours with the meanings of IEC 60204-1 §10.2–10.3 / IEC 60073:
 * red emergency/stop, yellow abnormal, green normal/start, blue mandatory action,
 * white/grey/black no specific meaning.
 */
export const deviceColourSchema = z.enum(['red', 'yellow', 'green', 'blue', 'white', 'grey', 'black']);

/** Position of a panel device on the front plate, in millimetres from the top-left corner. */
const plateSchema = z.object({ x: z.number().min(0).max(5000), y: z.number().min(0).max(5000) });

const panelCommon = {
  id: idSchema,
  label: textSchema,
  colour: deviceColourSchema,
  position: plateSchema,
};

/**
 * What an operator button does on the machine, so its colour can be checked against
 * IEC 60204-1 §10.2 (see panel-colours.ts): start, stop, reset, an alternately acting
 * start/stop, or something else (no colour rule).
 */
export const buttonFunctionSchema = z.enum(['start', 'stop', 'reset', 'start-stop', 'other']);

const contactKind = z.enum(['NO', 'NC']);
const buttonAction = z.enum(['momentary', 'maintained']);
const analogSignal = z.enum(['0-10V', '4-20mA']);
const wordEncoding = z.enum(['binary', 'bcd', 'gray']);
const sensorOutput = z.enum(['PNP', 'NPN']);

/** Operator panel devices. Terminal names per type are listed in `deviceTerminals` (terminals.ts). */
export const panelDeviceSchema = z.discriminatedUnion('type', [
  z.object({ ...panelCommon, type: z.literal('push-button'), contact: contactKind, action: buttonAction, function: buttonFunctionSchema.optional() }),
  z.object({
    ...panelCommon,
    type: z.literal('illuminated-button'),
    contact: contactKind,
    action: buttonAction,
    function: buttonFunctionSchema.optional(),
  }),
  z.object({
    ...panelCommon,
    type: z.literal('selector-switch'),
    positions: z.array(textSchema).min(2).max(4),
  }),
  /** `colour` is the actuator's; `background` the plate behind it (yellow when omitted; IEC 60204-1 §10.7.3). */
  z.object({ ...panelCommon, type: z.literal('e-stop'), background: deviceColourSchema.optional() }),
  z.object({ ...panelCommon, type: z.literal('pilot-light') }),
  z.object({ ...panelCommon, type: z.literal('stack-light'), tiers: z.array(deviceColourSchema).min(1).max(5) }),
  z.object({
    ...panelCommon,
    type: z.literal('potentiometer'),
    signal: analogSignal,
    /** Engineering range shown on the dial, e.g. 0–100 %. */
    min: z.number(),
    max: z.number(),
    unit: z.string().max(16),
  }),
  z.object({ ...panelCommon, type: z.literal('numeric-display'), digits: z.number().int().min(1).max(5), encoding: wordEncoding }),
]);

const fieldCommon = { id: idSchema, label: textSchema };

/** Field devices: sensors and actuators in the cell. */
export const fieldDeviceSchema = z.discriminatedUnion('type', [
  z.object({ ...fieldCommon, type: z.literal('proximity-sensor'), output: sensorOutput }),
  z.object({ ...fieldCommon, type: z.literal('photo-eye'), output: sensorOutput, mode: z.enum(['light-on', 'dark-on']) }),
  z.object({ ...fieldCommon, type: z.literal('part-sensor'), output: sensorOutput }),
  /** Guard interlock switch; its NC contact is closed while the guard is closed (IEC 60947-5-1 Annex K). */
  z.object({ ...fieldCommon, type: z.literal('guard-switch'), contact: contactKind }),
  z.object({ ...fieldCommon, type: z.literal('gripper'), travelMs: durationMs }),
  z.object({ ...fieldCommon, type: z.literal('vacuum-cup'), buildMs: durationMs, releaseMs: durationMs }),
  z.object({ ...fieldCommon, type: z.literal('conveyor'), speed: z.number().min(0).max(10) }),
]);

const plcAddress = z
  .string()
  .max(16)
  .refine((s) => parseAddressCached(s) !== null, 'an IEC 61131-3 direct address such as %IX0.0 or %QW2');

/** A physical controller channel: rack, slot, channel (channels count from 0). */
export const channelRefSchema = z.object({
  rack: z.number().int().min(0).max(15),
  slot: z.number().int().min(0).max(63),
  channel: z.number().int().min(0).max(L.channelsPerModule - 1),
});

/** One end of a wire: a device terminal, a PLC direct address, or a controller channel. */
export const endpointSchema = z.union([
  z.object({ device: idSchema, terminal: z.string().min(1).max(32) }).strict(),
  z.object({ plc: plcAddress }).strict(),
  z.object({ controller: channelRefSchema }).strict(),
]);

/**
 * One terminal-strip row: a wire carrying a signal from `from` to `to`. A word address
 * (`%QW`, `%IW`) onto controller channels spans `bits` consecutive channels (bit 0 first).
 */
export const wiringRowSchema = z.object({
  id: idSchema,
  from: endpointSchema,
  to: endpointSchema,
  bits: z.number().int().min(1).max(16).optional(),
  label: textSchema.optional(),
});

/**
 * PLC I/O modules. A digital module covers `channels` bits from `%IX<address>.0` / `%QX<address>.0`
 * (a word such as `%QW<address>` reads or writes 16 of those bits, see simulator/address);
 * an analog input module covers words `%IW<address>`, `%IW<address+2>` … one per channel.
 */
export const plcModuleSchema = z.discriminatedUnion('kind', [
  z.object({
    id: idSchema,
    kind: z.literal('digital-in'),
    address: z.number().int().min(0).max(255),
    channels: z.number().int().min(1).max(32),
    /** sinking inputs need a PNP (sourcing) sensor, sourcing inputs an NPN one (common practice). */
    wiring: z.enum(['sinking', 'sourcing']),
    /** IEC 61131-2 input type for 24 V DC. */
    inputType: z.union([z.literal(1), z.literal(2), z.literal(3)]),
  }),
  z.object({ id: idSchema, kind: z.literal('digital-out'), address: z.number().int().min(0).max(255), channels: z.number().int().min(1).max(32) }),
  z.object({
    id: idSchema,
    kind: z.literal('analog-in'),
    address: z.number().int().min(0).max(255),
    channels: z.number().int().min(1).max(16),
    signal: analogSignal,
    resolutionBits: z.number().int().min(8).max(16),
    /**
     * How the module reports a reading in its word (electrical/analog.ts, `CountFormat`):
     * `unsigned` 0..2^bits − 1 over the nominal span (the default), or `signed`
     * 0..2^(bits−1) − 1 with negative counts below the span. Either saturates at its limits.
     */
    format: z.enum(['unsigned', 'signed']).optional(),
  }),
]);

/** Controller point families (DESIGN.md). */
export const pointFamilySchema = z.enum(['DI', 'DO', 'AI', 'AO', 'WI', 'WO', 'TI', 'TO']);
/** A logical point reference such as `DI3` or `WO1` (logical points count from 1). */
export const pointRefSchema = z.string().regex(/^(DI|DO|AI|AO|WI|WO|TI|TO)[1-9]\d{0,3}$/, 'a point such as DI3 or WO1');

/** A controller I/O module in a rack and slot. */
export const controllerModuleSchema = z.object({
  id: idSchema,
  rack: z.number().int().min(0).max(15),
  slot: z.number().int().min(0).max(63),
  type: z.enum(['digital-in', 'digital-out', 'analog-in', 'analog-out', 'tool-in', 'tool-out']),
  channels: z.number().int().min(1).max(L.channelsPerModule),
  signal: analogSignal.optional(),
  resolutionBits: z.number().int().min(8).max(16).optional(),
});

/** A point-map row: logical points `first..first+count-1` of a family onto a module location. */
export const pointMapRowSchema = z.object({
  id: idSchema,
  family: pointFamilySchema,
  first: z.number().int().min(1).max(9999),
  count: z.number().int().min(1).max(L.pointsPerRow),
  rack: z.number().int().min(0).max(15),
  slot: z.number().int().min(0).max(63),
  firstChannel: z.number().int().min(0).max(L.channelsPerModule - 1),
  /** For WI/WO: channels per word point (bit 0 on the lowest channel). */
  bits: z.number().int().min(1).max(16).optional(),
  /** For WI/WO: how the bits encode the number. */
  encoding: wordEncoding.optional(),
  points: z
    .array(z.object({ label: textSchema.optional(), invert: z.boolean().optional() }))
    .max(L.pointsPerRow)
    .optional(),
});

/** A condition over one logical point (booleans read as 0/1). */
export const conditionSchema = z.object({
  point: pointRefSchema,
  op: z.enum(['==', '!=', '>', '>=', '<', '<=']),
  value: z.number(),
});

const stepCommon = { label: idSchema.optional() };
const jumpTarget = z.union([idSchema, z.number().int().min(0).max(L.routineSteps - 1)]);

/** Routine steps. Jump and branch targets are a step label or a step index. */
export const routineStepSchema = z.discriminatedUnion('kind', [
  z.object({
    ...stepCommon,
    kind: z.literal('wait'),
    condition: conditionSchema,
    timeoutMs: durationMs.optional(),
    alarm: textSchema.optional(),
  }),
  z.object({ ...stepCommon, kind: z.literal('set'), point: pointRefSchema, value: z.number() }),
  z.object({ ...stepCommon, kind: z.literal('pulse'), point: pointRefSchema, ms: durationMs }),
  z.object({
    ...stepCommon,
    kind: z.literal('set-word'),
    point: pointRefSchema,
    value: z.number().int().min(0).max(65535),
    encoding: wordEncoding,
  }),
  z.object({ ...stepCommon, kind: z.literal('move'), pose: idSchema, speedPercent: z.number().min(1).max(100).optional() }),
  z.object({ ...stepCommon, kind: z.literal('pause'), ms: durationMs }),
  z.object({ ...stepCommon, kind: z.literal('branch'), condition: conditionSchema, to: jumpTarget }),
  z.object({ ...stepCommon, kind: z.literal('jump'), to: jumpTarget }),
  z.object({ ...stepCommon, kind: z.literal('alarm'), message: textSchema }),
]);

/** A taught pose: coordinates (2D Cartesian or joints) and the speed/acceleration used to reach it. */
export const poseSchema = z.object({
  id: idSchema,
  label: textSchema.optional(),
  coordinates: z.array(coordinate).min(1).max(L.axes),
  /** Path speed limit, units per second (> 0). */
  speed: z.number().gt(0).max(100),
  /** Path acceleration limit, units per second² (> 0). */
  accel: z.number().gt(0).max(1000),
});

/** Which logical points carry the handshake; every entry is optional. */
export const handshakeSchema = z.object({
  inputs: z
    .object({
      start: pointRefSchema,
      stop: pointRefSchema,
      faultReset: pointRefSchema,
      /** The word point carrying the recipe number the PLC selects (which part, which place). */
      recipe: pointRefSchema,
      guardClosed: pointRefSchema,
      estopHealthy: pointRefSchema,
      partPresent: pointRefSchema,
      partHeld: pointRefSchema,
    })
    .partial(),
  outputs: z
    .object({
      ready: pointRefSchema,
      atHome: pointRefSchema,
      cycling: pointRefSchema,
      atPosition: pointRefSchema,
      partHeld: pointRefSchema,
      cycleDone: pointRefSchema,
      fault: pointRefSchema,
    })
    .partial(),
});

/** Handshake output roles, in the order snapshots and signal lists show them (`hs.<role>`). */
export const HANDSHAKE_OUTPUT_ROLES = Object.freeze(Object.keys(handshakeSchema.shape.outputs.shape)) as readonly (keyof z.infer<typeof handshakeSchema>['outputs'])[];

/** The simulated robot controller. */
export const controllerSchema = z.object({
  axes: z.number().int().min(1).max(L.axes),
  bootMs: durationMs,
  ioRefreshMs: periodMs,
  /** IEC 60204-1 §9.2.2 stop category on e-stop: 0 removes power at once, 1 brakes then removes power. */
  stopCategory: z.union([z.literal(0), z.literal(1)]),
  homePose: idSchema,
  /** Distance within which the arm counts as at a pose. */
  positionTolerance: z.number().gt(0).max(1),
  cycleDonePulseMs: durationMs,
  modules: z.array(controllerModuleSchema).max(L.controllerModules),
  pointMap: z.array(pointMapRowSchema).max(L.pointMapRows),
  /** A point-map edit waiting for a controller restart; null when nothing is staged. */
  staged: z.array(pointMapRowSchema).max(L.pointMapRows).nullable(),
  handshake: handshakeSchema,
  routine: z.array(routineStepSchema).max(L.routineSteps),
  poses: z.array(poseSchema).max(L.poses),
});

/** How PLC and controller exchange signals. */
export const linkSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('hardwired') }),
  z.object({ kind: z.literal('fieldbus'), updatePeriodMs: periodMs, watchdogMs: z.number().int().min(1).max(L.periodMs * 10) }),
]);

/** Per-device starting state; anything omitted starts at rest (released, closed guard, no part). */
export const initialStateSchema = z.object({
  controllerPowered: z.boolean(),
  devices: z
    .record(
      idSchema,
      z
        .object({
          pressed: z.boolean(),
          latched: z.boolean(),
          position: z.number().int().min(0).max(3),
          value: z.number(),
          active: z.boolean(),
          partPresent: z.boolean(),
          guardClosed: z.boolean(),
        })
        .partial(),
    )
    .optional(),
});

/** The whole cell document. */
export const cellDocumentSchema = z.object({
  schemaVersion: z.literal(CELL_SCHEMA_VERSION),
  id: idSchema,
  name: textSchema.min(1),
  description: z.string().max(4000).optional(),
  /** Seed of the cell's PRNG (chatter and other seeded behaviour). */
  seed: z.number().int().min(0).max(0xffffffff),
  panel: z.array(panelDeviceSchema).max(L.panelDevices),
  field: z.array(fieldDeviceSchema).max(L.fieldDevices),
  link: linkSchema,
  plc: z.object({
    modules: z.array(plcModuleSchema).max(L.plcModules),
    sheet: logicSheetSchema,
  }),
  wiring: z.array(wiringRowSchema).max(L.wiringRows),
  /**
   * The 24 V DC control supply feeding the field devices and the I/O (24 V when omitted).
   * IEC 61131-2's tolerance is 20.4–28.8 V; a setting outside it is allowed (the inputs then
   * read it through their type's bands) and validation warns.
   */
  supply: z.object({ volts: z.number().min(0).max(36) }).optional(),
  controller: controllerSchema,
  initial: initialStateSchema,
});

/** A validated cell document (defaults applied). */
export type CellDocument = z.infer<typeof cellDocumentSchema>;
/** One operator panel device. */
export type PanelDevice = z.infer<typeof panelDeviceSchema>;
/** One field device. */
export type FieldDevice = z.infer<typeof fieldDeviceSchema>;
/** One end of a wire: device terminal, PLC address or controller channel. */
export type Endpoint = z.infer<typeof endpointSchema>;
/** One terminal-strip row. */
export type WiringRow = z.infer<typeof wiringRowSchema>;
/** One PLC I/O module. */
export type PlcModule = z.infer<typeof plcModuleSchema>;
/** One controller I/O module in a rack and slot. */
export type ControllerModule = z.infer<typeof controllerModuleSchema>;
/** One point-map row (logical range → rack / slot / first channel). */
export type PointMapRow = z.infer<typeof pointMapRowSchema>;
/** A controller point family: DI DO AI AO WI WO TI TO. */
export type PointFamily = z.infer<typeof pointFamilySchema>;
/** One routine step. */
export type RoutineStep = z.infer<typeof routineStepSchema>;
/** A condition over one logical point. */
export type Condition = z.infer<typeof conditionSchema>;
/** A taught pose. */
export type Pose = z.infer<typeof poseSchema>;
/** Handshake roles → logical points. */
export type Handshake = z.infer<typeof handshakeSchema>;
/** The controller section of a cell document. */
export type ControllerConfig = z.infer<typeof controllerSchema>;
/** How a word point encodes its number: binary, BCD or Gray. */
export type WordEncoding = z.infer<typeof wordEncoding>;
/** A physical controller channel (rack, slot, channel from 0). */
export type ChannelRef = z.infer<typeof channelRefSchema>;
