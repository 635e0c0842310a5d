/**
 * Events a cell accepts from the outside (an operator, a drill, a replayed log), as plain
 * JSON values. Each is validated before anything changes; a rejected event leaves the
 * cell untouched and returns the problems.
 */
import { z } from 'zod';
import { faultCardSchema } from '@/simulator/faults/fault-card';
import { pointMapRowSchema, poseSchema, routineStepSchema, wiringRowSchema } from '@/simulator/schema/cell-document';
import { CELL_LIMITS } from '@/simulator/schema/limits';
import { logicSheetSchema } from '@/simulator/plc/sheet-schema';

const id = z.string().min(1).max(CELL_LIMITS.idLength);

/** A force target: a PLC direct address (`%IX0.0`, `%QW1`) or a controller point (`DI3`). */
const forceTarget = z.string().min(2).max(16);

/** Every event a cell accepts. */
export const cellEventSchema = z.discriminatedUnion('type', [
  /** Press a push button or illuminated button (a maintained one toggles), or strike an e-stop (it latches). */
  z.object({ type: z.literal('press'), device: id }),
  /** Release a momentary button, or twist-release a latched e-stop. */
  z.object({ type: z.literal('release'), device: id }),
  /** Flip a maintained button or a field sensor's detection. */
  z.object({ type: z.literal('toggle'), device: id }),
  /** Turn a selector switch to a position (0-based). */
  z.object({ type: z.literal('set-selector'), device: id, position: z.number().int().min(0).max(3) }),
  /** Set a potentiometer to an engineering value within its range. */
  z.object({ type: z.literal('set-analog'), device: id, value: z.number() }),
  /**
   * Set what a field sensor sees: a target in front of a proximity sensor or photo-eye,
   * a part on a part sensor, a guard closed on a guard switch.
   */
  z.object({ type: z.literal('set-field'), device: id, active: z.boolean() }),
  /** Force a PLC address or controller point to a value (booleans as 0/1). */
  z.object({ type: z.literal('force'), target: forceTarget, value: z.number() }),
  /** Remove a force. */
  z.object({ type: z.literal('unforce'), target: forceTarget }),
  /** Restart the controller: staged point-map rows become live, the routine starts over. */
  z.object({ type: z.literal('restart-controller') }),
  /** Switch the controller's power. */
  z.object({ type: z.literal('power-controller'), on: z.boolean() }),
  /** Stage a point-map edit (takes effect on the next controller restart). */
  z.object({ type: z.literal('stage-point-map'), rows: z.array(pointMapRowSchema).max(CELL_LIMITS.pointMapRows) }),
  /** Drop a staged point-map edit. */
  z.object({ type: z.literal('discard-staged') }),
  /** Add a fault card (fires now, at its time, or on its trigger). */
  z.object({ type: z.literal('inject-fault'), fault: faultCardSchema }),
  /** Remove a fault card, active or armed. */
  z.object({ type: z.literal('clear-fault'), id }),
  /**
   * Download edited parts of the document into the running cell (like downloading a program
   * to a PLC): a new logic sheet (the PLC goes through stop → run), new terminal-strip rows,
   * and/or a new routine with its poses (the controller stops with the routine at step 0 when
   * it differs). At least one part; the merged document must validate. See docs/engine.md.
   */
  z.object({
    type: z.literal('download'),
    logic: logicSheetSchema.optional(),
    wiring: z.array(wiringRowSchema).max(CELL_LIMITS.wiringRows).optional(),
    routine: z
      .object({ steps: z.array(routineStepSchema).max(CELL_LIMITS.routineSteps), poses: z.array(poseSchema).max(CELL_LIMITS.poses) })
      .optional(),
  }),
]);

/** The `download` event: the parts of a cell document a student may change during a run. */
export type DownloadEvent = Extract<z.infer<typeof cellEventSchema>, { type: 'download' }>;

/** An event a cell accepts. */
export type CellEvent = z.infer<typeof cellEventSchema>;

/** One entry of a cell's event log: an event and the cell time (ms) it was applied at. */
export type LoggedEvent = { t: number; event: CellEvent };

/** Schema of an event log file (the headless runner's `--events`). */
export const eventLogSchema = z.array(z.object({ t: z.number().int().min(0).max(CELL_LIMITS.durationMs * 30), event: cellEventSchema })).max(100_000);
