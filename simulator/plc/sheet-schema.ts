/**
 * The logic sheet document: blocks with parameters and positions, and the connections
 * between their ports. Structural validation lives here (zod); graph validation
 * (dangling connections, port types, algebraic loops) in ./compile.ts.
 *
 * Limits (each a Problem when exceeded):
 * - at most {@link MAX_BLOCKS} blocks and {@link MAX_CONNECTIONS} connections;
 * - ids: 1..64 characters of letters, digits, `_ - . :`;
 * - times (PT) in ms: finite, 0 ≤ PT ≤ {@link MAX_TIME_MS} (the range of a 32-bit signed
 *   millisecond count, common practice for TIME);
 * - counter presets PV: integers in INT range −32768..32767 (IEC 61131-3 INT);
 * - scan period: 0 < scanPeriodMs ≤ {@link MAX_SCAN_PERIOD_MS};
 * - addresses: see simulator/address (byte 0..1023, bit 0..7); contacts read any area,
 *   coils and WORD_OUT write only %Q or %M.
 */
import { z } from 'zod';
import { parseAddress, type Area, type Size } from '@/simulator/address/address';
import { MAX_LOGIC_INPUTS, MIN_LOGIC_INPUTS } from './catalogue';

/** Most blocks on one sheet. */
export const MAX_BLOCKS = 20_000;
/** Most connections on one sheet. */
export const MAX_CONNECTIONS = 80_000;
/** Longest preset time, ms (2^31 − 1). */
export const MAX_TIME_MS = 2_147_483_647;
/** Longest scan period, ms. */
export const MAX_SCAN_PERIOD_MS = 10_000;
/** INT range of counter presets. */
export const INT_MIN = -32768;
export const INT_MAX = 32767;

const ID_PATTERN = /^[A-Za-z0-9_.:-]{1,64}$/;

/** Block or connection id. */
export const idSchema = z.string().regex(ID_PATTERN, 'id must be 1..64 letters, digits, _ - . or :');

/** A direct address restricted to the given sizes and areas, with the reason as a Problem code. */
function addressSchema(sizes: Size[], areas: Area[], what: string) {
  return z.string().superRefine((text, ctx) => {
    const r = parseAddress(text);
    if (!r.ok) {
      for (const e of r.errors) ctx.addIssue({ code: 'custom', message: e.message, params: { code: e.code } });
      return;
    }
    if (!sizes.includes(r.value.size)) {
      ctx.addIssue({
        code: 'custom',
        message: `${what} needs a ${sizes.map((s) => `%?${s}`).join(' or ')} address, not ${text}`,
        params: { code: 'address_size' },
      });
    }
    if (!areas.includes(r.value.area)) {
      ctx.addIssue({
        code: 'custom',
        message: `${what} may only use the ${areas.map((a) => `%${a}`).join(' or ')} area, not ${text}`,
        params: { code: 'address_area' },
      });
    }
  });
}

const timeMs = z.number().superRefine((v, ctx) => {
  if (!Number.isFinite(v)) ctx.addIssue({ code: 'custom', message: 'time must be a finite number of ms', params: { code: 'invalid_time' } });
  else if (v < 0) ctx.addIssue({ code: 'custom', message: `time must not be negative (got ${v} ms)`, params: { code: 'negative_time' } });
  else if (v > MAX_TIME_MS) ctx.addIssue({ code: 'custom', message: `time must be at most ${MAX_TIME_MS} ms`, params: { code: 'time_range' } });
});

const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });
const preset = z.number().int().min(INT_MIN).max(INT_MAX);

const position = z.object({ x: finite, y: finite });
const common = { id: idSchema, position, label: z.string().max(200).optional() };

const bitRead = addressSchema(['X'], ['I', 'Q', 'M'], 'a contact');
const bitWrite = addressSchema(['X'], ['Q', 'M'], 'a coil');
const wordRead = addressSchema(['B', 'W', 'D'], ['I', 'Q', 'M'], 'WORD_IN');
const wordWrite = addressSchema(['B', 'W', 'D'], ['Q', 'M'], 'WORD_OUT');

const empty = z.object({}).default({});
const logicParams = z.object({ inputs: z.number().int().min(MIN_LOGIC_INPUTS).max(MAX_LOGIC_INPUTS).default(2) }).default({ inputs: 2 });

const block = <T extends string, P extends z.ZodType>(type: T, params: P) =>
  z.object({ ...common, type: z.literal(type), params });

/**
 * SPAN_MAP parameters: the engineering span, optional clamping, and the raw span — given
 * both ends, or neither (then it comes from the analog input the block reads, see
 * ./validate.ts).
 */
const spanParams = z
  .object({ inMin: finite.optional(), inMax: finite.optional(), outMin: finite, outMax: finite, clamp: z.boolean().default(false) })
  .superRefine((p, ctx) => {
    if ((p.inMin === undefined) !== (p.inMax === undefined)) {
      const missing = p.inMin === undefined ? 'inMin' : 'inMax';
      ctx.addIssue({ code: 'custom', path: [missing], message: 'give both ends of the raw span (inMin and inMax), or neither', params: { code: 'invalid_span' } });
    } else if (p.inMin !== undefined && p.inMin === p.inMax) {
      ctx.addIssue({ code: 'custom', path: ['inMax'], message: 'inMin and inMax must differ', params: { code: 'invalid_span' } });
    }
  });

/** The scaling block's name before SPAN_MAP; sheets that still use it load as SPAN_MAP. */
const LEGACY_SPAN_TYPE = 'SCALE';

/** One block of the sheet, discriminated by `type`. */
export const blockSchema = z.discriminatedUnion('type', [
  block('NO_CONTACT', z.object({ address: bitRead })),
  block('NC_CONTACT', z.object({ address: bitRead })),
  block('COIL', z.object({ address: bitWrite })),
  block('SET_COIL', z.object({ address: bitWrite })),
  block('RESET_COIL', z.object({ address: bitWrite })),
  block('AND', logicParams),
  block('OR', logicParams),
  block('XOR', logicParams),
  block('NOT', empty),
  block('TON', z.object({ PT: timeMs })),
  block('TOF', z.object({ PT: timeMs })),
  block('TP', z.object({ PT: timeMs })),
  block('CTU', z.object({ PV: preset })),
  block('CTD', z.object({ PV: preset })),
  block('CTUD', z.object({ PV: preset })),
  block('SR', empty),
  block('RS', empty),
  block('R_TRIG', empty),
  block('F_TRIG', empty),
  block('GT', empty),
  block('GE', empty),
  block('EQ', empty),
  block('NE', empty),
  block('LE', empty),
  block('LT', empty),
  block('MOVE', empty),
  block('SEL', empty),
  block('LIMIT', empty),
  block('SPAN_MAP', spanParams),
  // Old documents: the same block under its former name, read as SPAN_MAP (their raw span is explicit).
  z.object({ ...common, type: z.literal(LEGACY_SPAN_TYPE), params: spanParams }).transform((b) => ({ ...b, type: 'SPAN_MAP' as const })),
  block('WORD_IN', z.object({ address: wordRead, signed: z.boolean().default(false) })),
  block('WORD_OUT', z.object({ address: wordWrite })),
  block('CONST', z.object({ value: finite })),
  block('CONST_BOOL', z.object({ value: z.boolean() })),
  block('PREV_BOOL', z.object({ initial: z.boolean().default(false) }).default({ initial: false })),
  block('PREV_NUM', z.object({ initial: finite.default(0) }).default({ initial: 0 })),
]);

const endpoint = z.object({ block: idSchema, port: z.string().min(1).max(32) });

/** A wire from one block's output port to another block's input port. */
export const connectionSchema = z.object({ id: idSchema, from: endpoint, to: endpoint });

/** The logic sheet: scan period, blocks and connections. */
export const logicSheetSchema = z.object({
  scanPeriodMs: z.number().superRefine((v, ctx) => {
    if (!(Number.isFinite(v) && v > 0 && v <= MAX_SCAN_PERIOD_MS)) {
      ctx.addIssue({
        code: 'custom',
        message: `scan period must be more than 0 and at most ${MAX_SCAN_PERIOD_MS} ms`,
        params: { code: 'invalid_scan_period' },
      });
    }
  }),
  blocks: z.array(blockSchema).max(MAX_BLOCKS, `a sheet holds at most ${MAX_BLOCKS} blocks`),
  connections: z.array(connectionSchema).max(MAX_CONNECTIONS, `a sheet holds at most ${MAX_CONNECTIONS} connections`),
});

/** A validated logic sheet (defaults applied). */
export type LogicSheet = z.output<typeof logicSheetSchema>;
/** A logic sheet as written in a document (defaults may be omitted). */
export type LogicSheetInput = z.input<typeof logicSheetSchema>;
/** One validated block. */
export type SheetBlock = LogicSheet['blocks'][number];
/** One connection. */
export type SheetConnection = LogicSheet['connections'][number];
