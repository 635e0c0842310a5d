/**
 * Fault cards: injectable faults, each applied in the layer where a technician would find it
 * (a device, a wire of the terminal strip, a module, the link). A card fires at a cell time
 * (`at`), when a signal condition first holds (`when`), or at once when neither is given.
 */
import { z } from 'zod';
import { CELL_LIMITS } from '@/simulator/schema/limits';

const id = z.string().min(1).max(CELL_LIMITS.idLength).regex(/^[A-Za-z][A-Za-z0-9_.-]*$/);

/** A comparison over one named signal (see simulator/trace/signals.ts for names). */
export type SignalPredicate =
  | { signal: string; op: '==' | '!=' | '>' | '>=' | '<' | '<='; value: number | string | boolean }
  | { all: SignalPredicate[] }
  | { any: SignalPredicate[] }
  | { not: SignalPredicate };

/** zod schema of {@link SignalPredicate}, nesting bounded by the array limits. */
export const signalPredicateSchema: z.ZodType<SignalPredicate> = z.lazy(() =>
  z.union([
    z.object({
      signal: z.string().min(1).max(120),
      op: z.enum(['==', '!=', '>', '>=', '<', '<=']),
      value: z.union([z.number(), z.string().max(120), z.boolean()]),
    }).strict(),
    z.object({ all: z.array(signalPredicateSchema).min(1).max(32) }).strict(),
    z.object({ any: z.array(signalPredicateSchema).min(1).max(32) }).strict(),
    z.object({ not: signalPredicateSchema }).strict(),
  ]),
);

const trigger = {
  /** Cell time in ms at which the fault appears. */
  at: z.number().int().min(0).max(CELL_LIMITS.durationMs * 30).optional(),
  /** The fault appears the first time this holds (checked after every update of the cell). */
  when: signalPredicateSchema.optional(),
};

const common = { id, label: z.string().max(CELL_LIMITS.textLength).optional(), ...trigger };

/** One fault card. */
export const faultCardSchema = z.discriminatedUnion('kind', [
  /** A sensor or contact that always reports "active" (a welded contact, a sensor seeing a bracket). */
  z.object({ ...common, kind: z.literal('stuck-on'), device: id }),
  /** A sensor or contact that never reports "active" (a dirty lens, a broken actuator). */
  z.object({ ...common, kind: z.literal('stuck-off'), device: id }),
  /** A broken wire on a terminal-strip row: no current flows. */
  z.object({ ...common, kind: z.literal('open-wire'), row: id }),
  /** The row's wire touches +24 V. */
  z.object({ ...common, kind: z.literal('short-24v'), row: id }),
  /** The row's wire touches 0 V. */
  z.object({ ...common, kind: z.literal('short-0v'), row: id }),
  /** An intermittent connection: in each window of `periodMs` the wire is open with probability `probability` (seeded). */
  z.object({ ...common, kind: z.literal('chatter'), row: id, periodMs: z.number().int().min(1).max(60_000), probability: z.number().min(0).max(1) }),
  /** Two rows' wires landed on each other's terminals. */
  z.object({ ...common, kind: z.literal('swapped-wires'), rows: z.tuple([id, id]) }),
  /** A PLC or controller I/O module that has failed: its points drop and it reports a module fault. */
  z.object({ ...common, kind: z.literal('dead-module'), module: id }),
  /** The PLC–controller link is lost (fieldbus stops updating; a hardwired link cable is unplugged). */
  z.object({ ...common, kind: z.literal('link-loss') }),
  /** A gripper, vacuum cup or conveyor that takes `factor` times its normal time. */
  z.object({ ...common, kind: z.literal('slow-actuator'), device: id, factor: z.number().min(1).max(1000) }),
  /** An analog signal that drifts by `ratePerS` signal units (V or mA) per second from the moment it appears. */
  z.object({ ...common, kind: z.literal('analog-drift'), device: id, ratePerS: z.number().min(-100).max(100) }),
  /** An analog signal that is lost: 0 V, or 0 mA on a 4–20 mA loop (NE 43 failed loop). */
  z.object({ ...common, kind: z.literal('analog-loss'), device: id }),
  /** A sensor replaced by one of the other output type (PNP ↔ NPN). */
  z.object({ ...common, kind: z.literal('sensor-type-mismatch'), device: id }),
  /** The 24 V control supply sags to `volts` (an overloaded or failing power supply): every contact, sensor and output delivers that. */
  z.object({ ...common, kind: z.literal('supply-sag'), volts: z.number().min(0).max(36) }),
  /**
   * A sensor that leaks `leakMa` through the input while it is off (a worn sensor, or a
   * two-wire one where a three-wire one belongs): the input sees the leakage times its own
   * resistance, which may land in its IEC 61131-2 transition band.
   */
  z.object({ ...common, kind: z.literal('sensor-leakage'), device: id, leakMa: z.number().min(0).max(10) }),
]);

/** A fault card. */
export type FaultCard = z.infer<typeof faultCardSchema>;
/** The kinds of fault card. */
export type FaultKind = FaultCard['kind'];

/** Every fault kind, in the order the catalogue lists them. */
export const FAULT_KINDS: readonly FaultKind[] = [
  'stuck-on',
  'stuck-off',
  'open-wire',
  'short-24v',
  'short-0v',
  'chatter',
  'swapped-wires',
  'dead-module',
  'link-loss',
  'slow-actuator',
  'analog-drift',
  'analog-loss',
  'sensor-type-mismatch',
  'supply-sag',
  'sensor-leakage',
];

/** What a technician would see for each fault kind, for drill briefs and the fault catalogue. */
export const FAULT_SYMPTOMS: Record<FaultKind, string> = {
  'stuck-on': 'the device and its input read active whatever the process does',
  'stuck-off': 'the device and its input never read active',
  'open-wire': 'the input reads off (an NC stop or guard circuit reads as stop); an output wire leaves its load dead',
  'short-24v': 'a sinking input reads on regardless of the device; a load is lit or energised all the time',
  'short-0v': 'a sinking input reads off (a sourcing input reads on); a load stays dead',
  chatter: 'the input flickers on and off while the device is steady',
  'swapped-wires': 'each of the two inputs follows the other device',
  'dead-module': 'every point of the module drops and the module reports a fault',
  'link-loss': 'PLC–controller signals stop updating; the controller reports a link fault (fieldbus)',
  'slow-actuator': 'feedback arrives late; a routine wait may time out',
  'analog-drift': 'the analog value creeps away from the dial setting',
  'analog-loss': 'the analog value drops to 0 V / 0 mA; a 4–20 mA loop reads as failed',
  'sensor-type-mismatch': 'the sensor LED lights but the input stays off',
  'supply-sag': 'the supply measures low; type 1 inputs hold their last state or waver while type 2 and 3 inputs still read on down to 11 V',
  'sensor-leakage': 'with the sensor off, a few volts stay on its input; a type 1 input holds its last state, type 2 and 3 inputs read off',
};

/** Whether a chatter fault holds its wire open at `timeMs`: stateless (window index → seeded hash), so replay-safe. */
export function chatterOpen(seed: number, cardIndex: number, periodMs: number, probability: number, timeMs: number): boolean {
  const window = Math.floor(timeMs / periodMs);
  return hash01(seed, cardIndex, window) < probability;
}

/**
 * Counter-based PRNG: a uniform value in [0, 1) from (seed, stream, counter), so chatter
 * depends only on the cell's seed and time — replaying a run reproduces it exactly.
 * The mixing function is a 32-bit integer hash in the style of "lowbias32" (from memory).
 */
export function hash01(seed: number, stream: number, counter: number): number {
  let x = (seed ^ Math.imul(stream + 1, 0x9e3779b9) ^ Math.imul(counter + 1, 0x85ebca6b)) >>> 0;
  x ^= x >>> 16;
  x = Math.imul(x, 0x7feb352d);
  x ^= x >>> 15;
  x = Math.imul(x, 0x846ca68b);
  x ^= x >>> 16;
  return (x >>> 0) / 4294967296;
}
