/**
 * Test helper: hand-built logic sheets with known interlock bugs and their corrected
 * versions, on invented signals. Used only by tests.
 *
 * Signals (all invented): %IX0.0 start push button (NO: on while pressed), %IX0.1 stop
 * push button (NC, as stop circuits are wired in common practice: on while NOT pressed),
 * %IX0.2 guard closed (on while the guard is shut), %IX0.3 e-stop chain healthy (NC
 * contacts in series, common practice: on while no e-stop is pressed and no wire broken),
 * %QX0.1 robot start request.
 */
import type { LogicSheetInput } from '@/simulator/plc';
import type { CellDocumentInput } from '@/simulator/demo';
import { starterCell } from '@/simulator/demo';

type B = LogicSheetInput['blocks'][number];
const at = { x: 0, y: 0 };
/** A block with the given id, type and parameters. */
export const blk = (id: string, type: B['type'], params: Record<string, unknown> = {}): B => ({ id, type, params, position: at }) as B;
/** A wire from `from.fp` to `to.tp`. */
export const wire = (from: string, fp: string, to: string, tp: string) => ({ id: `${from}.${fp}:${to}.${tp}`, from: { block: from, port: fp }, to: { block: to, port: tp } });
/** A sheet scanned every `scanPeriodMs` (10 ms unless given). */
export const sheetOf = (blocks: B[], connections: ReturnType<typeof wire>[], scanPeriodMs = 10): LogicSheetInput => ({ scanPeriodMs, blocks, connections });

/**
 * Bug: the start request is latched (set-dominant SR) by start AND guard closed, and only
 * stop resets it — so the request stays latched after the guard opens.
 */
export const guardBypassedByLatch = sheetOf(
  [
    blk('start', 'NO_CONTACT', { address: '%IX0.0' }),
    blk('guard', 'NO_CONTACT', { address: '%IX0.2' }),
    blk('permit', 'AND'),
    blk('stopPressed', 'NC_CONTACT', { address: '%IX0.1' }),
    blk('latch', 'SR'),
    blk('request', 'COIL', { address: '%QX0.1' }),
  ],
  [
    wire('start', 'Q', 'permit', 'IN1'),
    wire('guard', 'Q', 'permit', 'IN2'),
    wire('permit', 'Q', 'latch', 'S1'),
    wire('stopPressed', 'Q', 'latch', 'R'),
    wire('latch', 'Q1', 'request', 'IN'),
  ],
);

/** Corrected: the latch is reset-dominant (RS) and reset by stop OR guard open. */
export const guardResetsLatch = sheetOf(
  [
    blk('start', 'NO_CONTACT', { address: '%IX0.0' }),
    blk('guard', 'NO_CONTACT', { address: '%IX0.2' }),
    blk('permit', 'AND'),
    blk('stopPressed', 'NC_CONTACT', { address: '%IX0.1' }),
    blk('guardOpen', 'NC_CONTACT', { address: '%IX0.2' }),
    blk('reset', 'OR'),
    blk('latch', 'RS'),
    blk('request', 'COIL', { address: '%QX0.1' }),
  ],
  [
    wire('start', 'Q', 'permit', 'IN1'),
    wire('guard', 'Q', 'permit', 'IN2'),
    wire('permit', 'Q', 'latch', 'S'),
    wire('stopPressed', 'Q', 'reset', 'IN1'),
    wire('guardOpen', 'Q', 'reset', 'IN2'),
    wire('reset', 'Q', 'latch', 'R1'),
    wire('latch', 'Q1', 'request', 'IN'),
  ],
);

/** Corrected another way: the buggy latch kept, the guard in series with its output. */
export const guardInSeries = sheetOf(
  [
    blk('start', 'NO_CONTACT', { address: '%IX0.0' }),
    blk('guard', 'NO_CONTACT', { address: '%IX0.2' }),
    blk('permit', 'AND'),
    blk('stopPressed', 'NC_CONTACT', { address: '%IX0.1' }),
    blk('latch', 'SR'),
    blk('guardNow', 'NO_CONTACT', { address: '%IX0.2' }),
    blk('request', 'COIL', { address: '%QX0.1' }),
  ],
  [
    wire('start', 'Q', 'permit', 'IN1'),
    wire('guard', 'Q', 'permit', 'IN2'),
    wire('permit', 'Q', 'latch', 'S1'),
    wire('stopPressed', 'Q', 'latch', 'R'),
    wire('latch', 'Q1', 'guardNow', 'IN'),
    wire('guardNow', 'Q', 'request', 'IN'),
  ],
);

/**
 * Bug: the e-stop chain is read as if it were wired NO (an NC contact in the logic passes
 * while the input is off), so a pressed e-stop — or a broken wire — permits the start.
 * The seal-in on %QX0.1 keeps the request after start is released.
 */
function estopSheet(estopContact: 'NO_CONTACT' | 'NC_CONTACT'): LogicSheetInput {
  return sheetOf(
    [
      blk('start', 'NO_CONTACT', { address: '%IX0.0' }),
      blk('seal', 'NO_CONTACT', { address: '%QX0.1' }),
      blk('startOrSeal', 'OR'),
      blk('stopOk', 'NO_CONTACT', { address: '%IX0.1' }),
      blk('estopOk', estopContact, { address: '%IX0.3' }),
      blk('permit', 'AND', { inputs: 3 }),
      blk('request', 'COIL', { address: '%QX0.1' }),
    ],
    [
      wire('start', 'Q', 'startOrSeal', 'IN1'),
      wire('seal', 'Q', 'startOrSeal', 'IN2'),
      wire('startOrSeal', 'Q', 'permit', 'IN1'),
      wire('stopOk', 'Q', 'permit', 'IN2'),
      wire('estopOk', 'Q', 'permit', 'IN3'),
      wire('permit', 'Q', 'request', 'IN'),
    ],
  );
}
/** The e-stop wired as NO (the bug). */
export const estopWiredNo = estopSheet('NC_CONTACT');
/** The e-stop read as the NC chain it is (correct). */
export const estopWiredNc = estopSheet('NO_CONTACT');

/** The starter demo cell with its logic sheet replaced (the panel, modules and wiring kept). */
export function cellWithSheet(sheet: LogicSheetInput): CellDocumentInput {
  return { ...starterCell, id: 'prove-test-cell', plc: { ...starterCell.plc, sheet } } as CellDocumentInput;
}
