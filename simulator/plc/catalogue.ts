/**
 * The block catalogue: every block type's typed ports and default parameters.
 *
 * This is the single description of block interfaces. The compiler and the reference
 * interpreter type-check wiring against it, and the canvas renders ports from it;
 * block semantics (what a block computes) live only in the engine.
 *
 * Data types: `BOOL`; `NUM` for INT and REAL values (a JavaScript number); `TIME` for a
 * duration in milliseconds. NUM and TIME are both numbers and may be wired to each other
 * (a preset computed by arithmetic, an elapsed time compared with a limit); BOOL may only
 * be wired to BOOL.
 */

/** Port data type. */
export type PortType = 'BOOL' | 'NUM' | 'TIME';

/** One input or output port of a block. */
export type PortSpec = {
  name: string;
  type: PortType;
  /** Value of an unconnected input (outputs carry their initial value here). */
  default: boolean | number;
  /** When set, an unconnected input takes this parameter's value instead of `default`. */
  fromParam?: string;
  /** One line for tooltips. */
  doc: string;
};

/** Broad families, for grouping in a palette. */
export type BlockGroup =
  | 'contact'
  | 'coil'
  | 'logic'
  | 'timer'
  | 'counter'
  | 'bistable'
  | 'edge'
  | 'compare'
  | 'select'
  | 'numeric'
  | 'word'
  | 'constant'
  | 'feedback';

/** Every block type the engine knows. */
export const BLOCK_TYPES = [
  'NO_CONTACT',
  'NC_CONTACT',
  'COIL',
  'SET_COIL',
  'RESET_COIL',
  'AND',
  'OR',
  'XOR',
  'NOT',
  'TON',
  'TOF',
  'TP',
  'CTU',
  'CTD',
  'CTUD',
  'SR',
  'RS',
  'R_TRIG',
  'F_TRIG',
  'GT',
  'GE',
  'EQ',
  'NE',
  'LE',
  'LT',
  'MOVE',
  'SEL',
  'LIMIT',
  'SPAN_MAP',
  'WORD_IN',
  'WORD_OUT',
  'CONST',
  'CONST_BOOL',
  'PREV_BOOL',
  'PREV_NUM',
] as const;

/** A block type name. */
export type BlockType = (typeof BLOCK_TYPES)[number];

/** Catalogue entry of one block type. */
export type BlockSpec = {
  type: BlockType;
  group: BlockGroup;
  summary: string;
  /** Input ports with default parameters; see {@link blockPorts} for a configured block. */
  inputs: PortSpec[];
  outputs: PortSpec[];
  defaultParams: Record<string, unknown>;
  /** Present on blocks whose input count is the `inputs` parameter (IN1..INn). */
  variadic?: { param: 'inputs'; prefix: 'IN'; min: number; max: number };
  /** True when the block's output does not depend on its input in the same scan. */
  breaksLoops?: boolean;
  /** Numeric parameters that may be left out, with what stands in for them (an editor offers them empty). */
  optionalParams?: Readonly<Record<string, string>>;
};

/** Bounds of the variadic logic blocks' input count. */
export const MIN_LOGIC_INPUTS = 2;
export const MAX_LOGIC_INPUTS = 16;

const b = (name: string, doc: string, dflt = false, fromParam?: string): PortSpec =>
  fromParam ? { name, type: 'BOOL', default: dflt, fromParam, doc } : { name, type: 'BOOL', default: dflt, doc };
const n = (name: string, doc: string, dflt = 0, fromParam?: string): PortSpec =>
  fromParam ? { name, type: 'NUM', default: dflt, fromParam, doc } : { name, type: 'NUM', default: dflt, doc };
const t = (name: string, doc: string, dflt = 0, fromParam?: string): PortSpec =>
  fromParam ? { name, type: 'TIME', default: dflt, fromParam, doc } : { name, type: 'TIME', default: dflt, doc };

const logicInputs = (count: number): PortSpec[] =>
  Array.from({ length: count }, (_, i) => b(`IN${i + 1}`, `input ${i + 1}`));

const compare = (type: BlockType, op: string): BlockSpec => ({
  type,
  group: 'compare',
  summary: `Q is TRUE when IN1 ${op} IN2`,
  inputs: [n('IN1', 'left operand'), n('IN2', 'right operand')],
  outputs: [b('Q', `IN1 ${op} IN2`)],
  defaultParams: {},
});

const contact = (type: BlockType, summary: string): BlockSpec => ({
  type,
  group: 'contact',
  summary,
  // An unconnected IN is the left power rail: TRUE.
  inputs: [b('IN', 'power flow in (TRUE when unconnected: the left rail)', true)],
  outputs: [b('Q', 'power flow out')],
  defaultParams: { address: '%IX0.0' },
});

const coil = (type: BlockType, summary: string): BlockSpec => ({
  type,
  group: 'coil',
  summary,
  inputs: [b('IN', 'power flow in')],
  outputs: [b('Q', 'power flow out (same as IN)')],
  defaultParams: { address: '%QX0.0' },
});

const timer = (type: BlockType, summary: string): BlockSpec => ({
  type,
  group: 'timer',
  summary,
  inputs: [b('IN', 'timer input'), t('PT', 'preset time in ms (the PT parameter when unconnected)', 0, 'PT')],
  outputs: [b('Q', 'timer output'), t('ET', 'elapsed time in ms')],
  defaultParams: { PT: 1000 },
});

const specs: BlockSpec[] = [
  contact('NO_CONTACT', 'Normally open contact: passes power flow while the addressed bit is 1'),
  contact('NC_CONTACT', 'Normally closed contact: passes power flow while the addressed bit is 0'),
  coil('COIL', 'Coil: writes power flow to the addressed bit every scan'),
  coil('SET_COIL', 'Set coil: sets the addressed bit while power flows; never clears it'),
  coil('RESET_COIL', 'Reset coil: clears the addressed bit while power flows; never sets it'),
  {
    type: 'AND',
    group: 'logic',
    summary: 'Q is TRUE when every input is TRUE',
    inputs: logicInputs(2),
    outputs: [b('Q', 'conjunction')],
    defaultParams: { inputs: 2 },
    variadic: { param: 'inputs', prefix: 'IN', min: MIN_LOGIC_INPUTS, max: MAX_LOGIC_INPUTS },
  },
  {
    type: 'OR',
    group: 'logic',
    summary: 'Q is TRUE when any input is TRUE',
    inputs: logicInputs(2),
    outputs: [b('Q', 'disjunction')],
    defaultParams: { inputs: 2 },
    variadic: { param: 'inputs', prefix: 'IN', min: MIN_LOGIC_INPUTS, max: MAX_LOGIC_INPUTS },
  },
  {
    type: 'XOR',
    group: 'logic',
    summary: 'Q is TRUE when an odd number of inputs are TRUE (IEC 61131-3 extensible XOR)',
    inputs: logicInputs(2),
    outputs: [b('Q', 'odd parity')],
    defaultParams: { inputs: 2 },
    variadic: { param: 'inputs', prefix: 'IN', min: MIN_LOGIC_INPUTS, max: MAX_LOGIC_INPUTS },
  },
  {
    type: 'NOT',
    group: 'logic',
    summary: 'Q is the negation of IN',
    inputs: [b('IN', 'input')],
    outputs: [b('Q', 'negation')],
    defaultParams: {},
  },
  timer('TON', 'On-delay: Q rises when IN has been TRUE for PT; ET counts 0..PT'),
  timer('TOF', 'Off-delay: Q follows IN up and falls PT after IN falls; IN re-arms it'),
  timer('TP', 'Pulse: a rising IN starts a pulse of length PT; not retriggerable while running'),
  {
    type: 'CTU',
    group: 'counter',
    summary: 'Up counter: counts rising edges of CU; R clears and dominates; Q when CV >= PV',
    inputs: [b('CU', 'count up (rising edge)'), b('R', 'reset'), n('PV', 'preset (the PV parameter when unconnected)', 0, 'PV')],
    outputs: [b('Q', 'CV >= PV'), n('CV', 'count')],
    defaultParams: { PV: 10 },
  },
  {
    type: 'CTD',
    group: 'counter',
    summary: 'Down counter: counts rising edges of CD down; LD loads PV; Q when CV <= 0',
    inputs: [b('CD', 'count down (rising edge)'), b('LD', 'load PV'), n('PV', 'preset (the PV parameter when unconnected)', 0, 'PV')],
    outputs: [b('Q', 'CV <= 0'), n('CV', 'count')],
    defaultParams: { PV: 10 },
  },
  {
    type: 'CTUD',
    group: 'counter',
    summary: 'Up/down counter: R clears (dominant), LD loads PV, CU/CD count edges',
    inputs: [
      b('CU', 'count up (rising edge)'),
      b('CD', 'count down (rising edge)'),
      b('R', 'reset (dominates LD)'),
      b('LD', 'load PV'),
      n('PV', 'preset (the PV parameter when unconnected)', 0, 'PV'),
    ],
    outputs: [b('QU', 'CV >= PV'), b('QD', 'CV <= 0'), n('CV', 'count')],
    defaultParams: { PV: 10 },
  },
  {
    type: 'SR',
    group: 'bistable',
    summary: 'Set-dominant latch: Q1 := S1 OR (NOT R AND Q1)',
    inputs: [b('S1', 'set (dominant)'), b('R', 'reset')],
    outputs: [b('Q1', 'latched output')],
    defaultParams: {},
  },
  {
    type: 'RS',
    group: 'bistable',
    summary: 'Reset-dominant latch: Q1 := NOT R1 AND (S OR Q1)',
    inputs: [b('S', 'set'), b('R1', 'reset (dominant)')],
    outputs: [b('Q1', 'latched output')],
    defaultParams: {},
  },
  {
    type: 'R_TRIG',
    group: 'edge',
    summary: 'Rising edge: Q is TRUE for one scan when CLK goes from FALSE to TRUE',
    inputs: [b('CLK', 'signal')],
    outputs: [b('Q', 'one-scan pulse')],
    defaultParams: {},
  },
  {
    type: 'F_TRIG',
    group: 'edge',
    summary: 'Falling edge: Q is TRUE for one scan when CLK goes from TRUE to FALSE (and on a first scan with CLK FALSE)',
    inputs: [b('CLK', 'signal')],
    outputs: [b('Q', 'one-scan pulse')],
    defaultParams: {},
  },
  compare('GT', '>'),
  compare('GE', '>='),
  compare('EQ', '='),
  compare('NE', '<>'),
  compare('LE', '<='),
  compare('LT', '<'),
  {
    type: 'MOVE',
    group: 'select',
    summary: 'OUT := IN',
    inputs: [n('IN', 'value')],
    outputs: [n('OUT', 'copy of IN')],
    defaultParams: {},
  },
  {
    type: 'SEL',
    group: 'select',
    summary: 'OUT := IN0 when G is FALSE, IN1 when G is TRUE',
    inputs: [b('G', 'selector'), n('IN0', 'chosen when G is FALSE'), n('IN1', 'chosen when G is TRUE')],
    outputs: [n('OUT', 'selected value')],
    defaultParams: {},
  },
  {
    type: 'LIMIT',
    group: 'select',
    summary: 'OUT := MIN(MAX(IN, MN), MX)',
    inputs: [n('MN', 'lower limit'), n('IN', 'value'), n('MX', 'upper limit')],
    outputs: [n('OUT', 'limited value')],
    defaultParams: {},
  },
  {
    type: 'SPAN_MAP',
    group: 'numeric',
    summary: 'Span map: maps the raw span inMin..inMax linearly onto outMin..outMax (optionally clamped); without inMin/inMax the raw span is that of the analog input IN reads',
    inputs: [n('IN', 'raw value')],
    outputs: [n('OUT', 'value in engineering units')],
    defaultParams: { outMin: 0, outMax: 100, clamp: false },
    optionalParams: {
      inMin: 'the bottom of the raw span read by the WORD_IN feeding IN: 0',
      inMax: "the top of that raw span: the count range of the analog module it reads (its declared format), or the word's own range",
    },
  },
  {
    type: 'WORD_IN',
    group: 'word',
    summary: 'Reads a byte, word or double word (e.g. %IW0) as a number',
    inputs: [],
    outputs: [n('OUT', 'value read')],
    defaultParams: { address: '%IW0', signed: false },
  },
  {
    type: 'WORD_OUT',
    group: 'word',
    summary: 'Writes a number to a byte, word or double word (e.g. %QW0), rounded and wrapped',
    inputs: [n('IN', 'value to write')],
    outputs: [],
    defaultParams: { address: '%QW0' },
  },
  {
    type: 'CONST',
    group: 'constant',
    summary: 'A numeric constant',
    inputs: [],
    outputs: [n('OUT', 'the value')],
    defaultParams: { value: 0 },
  },
  {
    type: 'CONST_BOOL',
    group: 'constant',
    summary: 'A BOOL constant',
    inputs: [],
    outputs: [b('Q', 'the value')],
    defaultParams: { value: false },
  },
  {
    type: 'PREV_BOOL',
    group: 'feedback',
    summary: 'Previous-scan value of a BOOL: the only way to close a feedback loop',
    inputs: [b('IN', 'value to remember')],
    outputs: [b('Q', 'IN as it was at the end of the previous scan')],
    defaultParams: { initial: false },
    breaksLoops: true,
  },
  {
    type: 'PREV_NUM',
    group: 'feedback',
    summary: 'Previous-scan value of a number: the only way to close a feedback loop',
    inputs: [n('IN', 'value to remember')],
    outputs: [n('OUT', 'IN as it was at the end of the previous scan')],
    defaultParams: { initial: 0 },
    breaksLoops: true,
  },
];

/** The catalogue, keyed by block type. */
export const blockCatalogue: Readonly<Record<BlockType, BlockSpec>> = Object.freeze(
  Object.fromEntries(specs.map((s) => [s.type, s])) as Record<BlockType, BlockSpec>,
);

/** True when `type` is a known block type. */
export function isBlockType(type: string): type is BlockType {
  return Object.prototype.hasOwnProperty.call(blockCatalogue, type);
}

/**
 * The ports of a configured block: the variadic logic blocks get IN1..INn from their
 * `inputs` parameter (clamped to the documented bounds); other blocks their catalogue ports.
 */
export function blockPorts(type: BlockType, params: Record<string, unknown> = {}): { inputs: PortSpec[]; outputs: PortSpec[] } {
  const spec = blockCatalogue[type];
  if (spec.variadic) {
    const raw = params[spec.variadic.param];
    const count =
      typeof raw === 'number' && Number.isInteger(raw)
        ? Math.min(spec.variadic.max, Math.max(spec.variadic.min, raw))
        : spec.variadic.min;
    return { inputs: logicInputs(count), outputs: spec.outputs };
  }
  return { inputs: spec.inputs, outputs: spec.outputs };
}

/** Whether an output of type `from` may drive an input of type `to` (see the module comment). */
export function portTypesCompatible(from: PortType, to: PortType): boolean {
  return from === to || (from !== 'BOOL' && to !== 'BOOL');
}
