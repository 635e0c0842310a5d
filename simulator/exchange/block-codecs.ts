/**
 * How each Cellwright block type appears in an IEC 61131-10 FBD network, both ways: one
 * table entry per type, with `encode` (sheet block → FBD elements) and `decode` (FBD
 * elements → block parameters and the pins its ports sit on).
 *
 * Mapping (IEC 61131-3 names; element structure from memory of IEC 61131-10):
 * - standard function blocks TON TOF TP CTU CTD CTUD SR RS R_TRIG F_TRIG: a `block` with an
 *   instance; presets (PT, PV) are the instance's initial values, which an unconnected
 *   input keeps (IEC 61131-3 FB semantics, from memory);
 * - standard functions AND OR XOR NOT GT GE EQ NE LE LT MOVE SEL LIMIT: a `block` without
 *   an instance, output pin `OUT`; an extensible AND/OR/XOR lists IN1..INn;
 * - contacts: an `inVariable` reading the direct address (`negated` for NC); with power flow
 *   wired in, an AND of that flow and the address;
 * - COIL: an `outVariable` writing the address; SET_COIL / RESET_COIL: the address read,
 *   ORed with IN (or ANDed with NOT IN) and written back — the same effect as a set/reset
 *   coil, in plain FBD;
 * - WORD_IN: the address through the standard conversion (WORD_TO_UINT, WORD_TO_INT, …);
 *   WORD_OUT: our CW_TO_WORD (or _BYTE, _DWORD) into an `outVariable`;
 * - SPAN_MAP: our function block CW_SPAN_MAP, its spans as instance initial values (a raw span
 *   left to the analog input stays left out: no IN_MIN / IN_MAX);
 * - CONST, CONST_BOOL: an `inVariable` holding the literal;
 * - PREV_BOOL / PREV_NUM: a variable read where the block stands and written by an
 *   `outVariable` executed after everything else (its initial value is the block's).
 * Helper elements carry `part` data naming their block and role, so the round trip is exact.
 */
import { parseAddress, type Size } from '@/simulator/address/address';
import { blockCatalogue, blockPorts, MAX_LOGIC_INPUTS, MIN_LOGIC_INPUTS, type BlockType } from '@/simulator/plc/catalogue';
import type { SheetBlock } from '@/simulator/plc/sheet-schema';
import { pinKey, type ElementMeta, type FbdBlock, type FbdConnection, type FbdElement, type FbdInput, type FbdInVariable, type FbdOutVariable, type InterfaceVariable } from './fbd-model';
import { iecNumber, iecReal, parseBool, parseIecNumber, parseTime } from './iec-text';
import { formatMember, LEGACY_SPAN_FB, parseMember, presetMembers, SPAN_FB } from './presets';

export { formatMember, presetMembers, SPAN_FB } from './presets';

/** Where a sheet port sits: one pin of one element. */
export type PinRef = { localId: number; pin: string | null };
/** A sheet output's pin, or `passThrough` when it equals one of the block's inputs (coils). */
export type OutputRef = PinRef | { passThrough: string };

/** What the exporter offers a codec. */
export type EncodeContext = {
  nextId(): number;
  /** The IEC identifier chosen for a block that needs one (instances, previous-scan variables). */
  nameOf(block: SheetBlock): string;
  declare(variable: InterfaceVariable): void;
  /** Whether a block input is wired on the sheet. */
  connected(block: SheetBlock, port: string): boolean;
};

/** A block's FBD elements and where its ports sit. */
export type EncodedBlock = {
  elements: FbdElement[];
  inputs: Record<string, PinRef>;
  outputs: Record<string, OutputRef>;
  /** The constant element standing for an unwired input (the source of a pass-through output then). */
  defaults: Record<string, PinRef>;
};

/** What the importer offers a codec. */
export type DecodeContext = {
  variable(name: string): InterfaceVariable | undefined;
  report(path: (string | number)[], code: string, message: string): void;
  pathOf(el: FbdElement): (string | number)[];
  /** Document path of a declared variable of the program's interface. */
  pathOfVariable(v: InterfaceVariable): (string | number)[];
};

/** Parameters of a decoded block and the meaning of its elements' pins (keys from {@link pinKey}). */
export type DecodedBlock = {
  params: Record<string, unknown>;
  inputs: Map<string, string>;
  outputs: Map<string, string>;
  /** Pins wired inside the block's own elements (not sheet wires). */
  internal: Set<string>;
};

type Codec = {
  encode(b: SheetBlock, ctx: EncodeContext): EncodedBlock;
  decode(main: FbdElement, parts: ReadonlyMap<string, FbdElement>, ctx: DecodeContext, type: BlockType): DecodedBlock | undefined;
};

/** Canvas offset of helper elements from their block, so a diagram viewer does not stack them. */
const PART_DX = 80;

/** Standard function blocks (IEC 61131-3 §6.6.3.5, from memory). */
const STANDARD_FBS = ['TON', 'TOF', 'TP', 'CTU', 'CTD', 'CTUD', 'SR', 'RS', 'R_TRIG', 'F_TRIG'] as const;
/** Standard functions the sheet's blocks are (IEC 61131-3 §6.6.2.5, from memory). */
const STANDARD_FUNCTIONS = ['AND', 'OR', 'XOR', 'NOT', 'GT', 'GE', 'EQ', 'NE', 'LE', 'LT', 'MOVE', 'SEL', 'LIMIT'] as const;
/** Standard bit-string-to-integer conversions used for WORD_IN: [unsigned, signed] by size. */
const WORD_IN_CONVERSIONS: Record<Exclude<Size, 'X'>, [string, string]> = {
  B: ['BYTE_TO_USINT', 'BYTE_TO_SINT'],
  W: ['WORD_TO_UINT', 'WORD_TO_INT'],
  D: ['DWORD_TO_UDINT', 'DWORD_TO_DINT'],
};
/** Cellwright's number-to-bit-string functions for WORD_OUT, by size (declared in the document). */
export const WORD_OUT_FUNCTIONS: Record<Exclude<Size, 'X'>, string> = { B: 'CW_TO_BYTE', W: 'CW_TO_WORD', D: 'CW_TO_DWORD' };
// ---- element builders

const blockMeta = (b: SheetBlock): ElementMeta => (b.label === undefined ? { kind: 'block', id: b.id, type: b.type } : { kind: 'block', id: b.id, type: b.type, label: b.label });
const partMeta = (b: SheetBlock, role: string): ElementMeta => ({ kind: 'part', of: b.id, role });
// The block's own element keeps its position exactly (adding 0 would turn -0 into 0).
const at = (b: SheetBlock, dx = 0) => ({ x: dx === 0 ? b.position.x : b.position.x + dx, y: b.position.y });
const link = (el: FbdElement, pin: string | null = null): FbdConnection => ({ ref: el.localId, pin });

function inVar(ctx: EncodeContext, b: SheetBlock, expression: string, negated: boolean, meta: ElementMeta, dx = 0): FbdInVariable {
  return { kind: 'inVariable', localId: ctx.nextId(), position: at(b, dx), expression, negated, meta };
}
function outVar(ctx: EncodeContext, b: SheetBlock, expression: string, meta: ElementMeta, source: FbdConnection | undefined, dx = 0): FbdOutVariable {
  return { kind: 'outVariable', localId: ctx.nextId(), position: at(b, dx), expression, negated: false, input: { pin: null, negated: false, connection: source }, meta };
}
function fbdBlock(ctx: EncodeContext, b: SheetBlock, typeName: string, inputs: FbdInput[], outputs: string[], instanceName?: string): FbdBlock {
  const el: FbdBlock = { kind: 'block', localId: ctx.nextId(), position: at(b), typeName, inputs, outputs, meta: blockMeta(b) };
  if (instanceName !== undefined) el.instanceName = instanceName;
  return el;
}
const pin = (name: string, negated = false, connection?: FbdConnection): FbdInput => (connection ? { pin: name, negated, connection } : { pin: name, negated });
const ref = (el: FbdElement, p: string | null): PinRef => ({ localId: el.localId, pin: p });

/** A FALSE (or 0) literal standing in for an unwired input of a write, so the written value is explicit. */
function defaultPart(ctx: EncodeContext, b: SheetBlock, literal: string): FbdInVariable {
  return inVar(ctx, b, literal, false, partMeta(b, 'default'), -PART_DX);
}

// ---- decode helpers

function shape(ctx: DecodeContext, el: FbdElement, message: string): undefined {
  ctx.report(ctx.pathOf(el), 'shape_mismatch', message);
  return undefined;
}
function inputPin(el: FbdBlock, name: string): FbdInput | undefined {
  return el.inputs.find((p) => p.pin === name);
}
/** Checks that `pin` of `el` is fed by `source` (an internal wire of the block). */
function fedBy(ctx: DecodeContext, el: FbdElement, p: FbdInput | undefined, source: FbdElement, negated: boolean): boolean {
  if (!p || p.connection?.ref !== source.localId || p.negated !== negated) {
    shape(ctx, el, `${describe(el)} must take ${p?.pin ?? 'its input'} ${negated ? 'negated ' : ''}from element ${source.localId}`);
    return false;
  }
  return true;
}
function describe(el: FbdElement): string {
  return el.kind === 'block' ? `block ${el.typeName} (localId ${el.localId})` : `${el.kind} "${el.expression}" (localId ${el.localId})`;
}
function part(ctx: DecodeContext, main: FbdElement, parts: ReadonlyMap<string, FbdElement>, role: string, kind: FbdElement['kind']): FbdElement | undefined {
  const p = parts.get(role);
  if (!p || p.kind !== kind) return shape(ctx, main, `${describe(main)} needs its "${role}" ${kind} (Cellwright part data)`);
  return p;
}
const decoded = (params: Record<string, unknown>, inputs: [string, string][], outputs: [string, string][], internal: string[] = []): DecodedBlock => ({
  params,
  inputs: new Map(inputs),
  outputs: new Map(outputs),
  internal: new Set(internal),
});

/** Pins of a block element checked against the expected names: unknown or negated pins are problems. */
function checkPins(ctx: DecodeContext, el: FbdBlock, expected: readonly string[]): boolean {
  let ok = true;
  for (const p of el.inputs) {
    if (p.pin === null || !expected.includes(p.pin)) {
      ctx.report([...ctx.pathOf(el), 'inputVariables', p.pin ?? ''], 'unknown_port', `${describe(el)} has no input "${p.pin ?? ''}" (inputs: ${expected.join(', ') || 'none'})`);
      ok = false;
    } else if (p.negated) {
      ctx.report([...ctx.pathOf(el), 'inputVariables', p.pin], 'unsupported_negation', `negated input ${p.pin} of ${describe(el)} has no Cellwright counterpart; put a NOT block in front`);
      ok = false;
    }
  }
  return ok;
}

// ---- codecs

function standardFb(typeName: string): Codec {
  return {
    encode(b, ctx) {
      const spec = blockCatalogue[b.type];
      const name = ctx.nameOf(b);
      const members = presetMembers(b.type);
      const params = b.params as Record<string, unknown>;
      const given = members.filter((m) => !(m.optional && params[m.param] === undefined));
      const initial = given.length > 0 ? { members: Object.fromEntries(given.map((m) => [m.member, formatMember(m.kind, params[m.param])])) } : undefined;
      ctx.declare(initial ? { name, type: typeName, derived: true, initial } : { name, type: typeName, derived: true });
      const el = fbdBlock(ctx, b, typeName, spec.inputs.map((p) => pin(p.name)), spec.outputs.map((p) => p.name), name);
      return {
        elements: [el],
        inputs: Object.fromEntries(spec.inputs.map((p) => [p.name, ref(el, p.name)])),
        outputs: Object.fromEntries(spec.outputs.map((p) => [p.name, ref(el, p.name)])),
        defaults: {},
      };
    },
    decode(main, _parts, ctx, type) {
      if (main.kind !== 'block' || main.typeName.toUpperCase() !== typeName) return shape(ctx, main, `a ${type} block must be a ${typeName} function block`);
      const spec = blockCatalogue[type];
      if (!checkPins(ctx, main, spec.inputs.map((p) => p.name))) return undefined;
      const params: Record<string, unknown> = {};
      const members = presetMembers(type);
      if (members.length > 0) {
        const instance = main.instanceName === undefined ? undefined : ctx.variable(main.instanceName);
        if (!instance) {
          ctx.report([...ctx.pathOf(main), 'instanceName'], 'undeclared_instance', `instance "${main.instanceName ?? ''}" of ${describe(main)} is not declared in the program's interface`);
          return undefined;
        }
        const given = instance.initial && 'members' in instance.initial ? instance.initial.members : {};
        const byUpper = new Map(Object.entries(given).map(([k, v]) => [k.toUpperCase(), v]));
        for (const m of members) {
          const text = byUpper.get(m.member);
          if (text === undefined && m.optional) continue;
          const value = text === undefined ? m.dflt : parseMember(m.kind, text);
          if (value === undefined) {
            ctx.report([...ctx.pathOfVariable(instance), 'initialValue', m.member], 'invalid_value', `${m.member} := ${text} is not a ${m.kind === 'time' ? 'TIME' : m.kind === 'bool' ? 'BOOL' : 'number'} literal`);
            return undefined;
          }
          params[m.param] = value;
        }
      }
      const k = (p: string) => pinKey(main.localId, p);
      return decoded(params, spec.inputs.map((p) => [k(p.name), p.name]), spec.outputs.map((p) => [k(p.name), p.name]));
    },
  };
}

/** SPAN_MAP as CW_SPAN_MAP, reading files that still call it by its former name as well. */
function spanFb(): Codec {
  const current = standardFb(SPAN_FB);
  const legacy = standardFb(LEGACY_SPAN_FB);
  return {
    ...current,
    decode: (main, parts, ctx, type) => (main.kind === 'block' && main.typeName.toUpperCase() === LEGACY_SPAN_FB ? legacy : current).decode(main, parts, ctx, type),
  };
}

function standardFunction(type: BlockType): Codec {
  return {
    encode(b, ctx) {
      const ports = blockPorts(b.type, b.params as Record<string, unknown>);
      const el = fbdBlock(ctx, b, type, ports.inputs.map((p) => pin(p.name)), ['OUT']);
      return {
        elements: [el],
        inputs: Object.fromEntries(ports.inputs.map((p) => [p.name, ref(el, p.name)])),
        outputs: { [ports.outputs[0].name]: ref(el, 'OUT') },
        defaults: {},
      };
    },
    decode(main, _parts, ctx) {
      if (main.kind !== 'block' || main.typeName.toUpperCase() !== type) return shape(ctx, main, `a ${type} block must be the ${type} function`);
      const spec = blockCatalogue[type];
      const params: Record<string, unknown> = {};
      if (spec.variadic) {
        // The extensible function's input count is the number of IN pins listed.
        const count = main.inputs.length === 0 ? MIN_LOGIC_INPUTS : main.inputs.length;
        if (count < MIN_LOGIC_INPUTS || count > MAX_LOGIC_INPUTS) {
          ctx.report([...ctx.pathOf(main), 'inputVariables'], 'invalid_value', `${type} takes ${MIN_LOGIC_INPUTS} to ${MAX_LOGIC_INPUTS} inputs, not ${count}`);
          return undefined;
        }
        params.inputs = count;
      }
      const ports = blockPorts(type, params);
      if (!checkPins(ctx, main, ports.inputs.map((p) => p.name))) return undefined;
      const k = (p: string) => pinKey(main.localId, p);
      return decoded(params, ports.inputs.map((p) => [k(p.name), p.name]), [[k('OUT'), ports.outputs[0].name]]);
    },
  };
}

const contact: Codec = {
  encode(b, ctx): EncodedBlock {
    const nc = b.type === 'NC_CONTACT';
    const address = (b.params as { address: string }).address;
    if (!ctx.connected(b, 'IN')) {
      const main = inVar(ctx, b, address, nc, blockMeta(b));
      return { elements: [main], inputs: {}, outputs: { Q: ref(main, null) }, defaults: {} };
    }
    const read = inVar(ctx, b, address, false, partMeta(b, 'read'), -PART_DX);
    const main = fbdBlock(ctx, b, 'AND', [pin('IN1'), pin('IN2', nc, link(read))], ['OUT']);
    return { elements: [read, main], inputs: { IN: ref(main, 'IN1') }, outputs: { Q: ref(main, 'OUT') }, defaults: {} };
  },
  decode(main, parts, ctx, type) {
    const nc = type === 'NC_CONTACT';
    if (main.kind === 'inVariable') {
      if (main.negated !== nc) return shape(ctx, main, `a ${type} reads its address ${nc ? 'negated' : 'as it is'}`);
      return decoded({ address: main.expression }, [], [[pinKey(main.localId, null), 'Q']]);
    }
    if (main.kind !== 'block' || main.typeName.toUpperCase() !== 'AND') return shape(ctx, main, `a ${type} is an inVariable, or an AND with its address`);
    const read = part(ctx, main, parts, 'read', 'inVariable') as FbdInVariable | undefined;
    if (!read || !fedBy(ctx, main, inputPin(main, 'IN2'), read, nc)) return undefined;
    if (!checkPins(ctx, { ...main, inputs: main.inputs.filter((p) => p.pin !== 'IN2') }, ['IN1'])) return undefined;
    return decoded({ address: read.expression }, [[pinKey(main.localId, 'IN1'), 'IN']], [[pinKey(main.localId, 'OUT'), 'Q']], [pinKey(main.localId, 'IN2')]);
  },
};

const coil: Codec = {
  encode(b, ctx): EncodedBlock {
    const address = (b.params as { address: string }).address;
    const dflt = ctx.connected(b, 'IN') ? undefined : defaultPart(ctx, b, 'FALSE');
    const before = dflt ? [dflt] : [];
    const defaults: Record<string, PinRef> = dflt ? { IN: ref(dflt, null) } : {};
    if (b.type === 'COIL') {
      const main = outVar(ctx, b, address, blockMeta(b), dflt && link(dflt));
      return { elements: [...before, main], inputs: { IN: ref(main, null) }, outputs: { Q: { passThrough: 'IN' } }, defaults };
    }
    const reset = b.type === 'RESET_COIL';
    const read = inVar(ctx, b, address, false, partMeta(b, 'read'), -PART_DX);
    const main = fbdBlock(ctx, b, reset ? 'AND' : 'OR', [pin('IN1', reset, dflt && link(dflt)), pin('IN2', false, link(read))], ['OUT']);
    const write = outVar(ctx, b, address, partMeta(b, 'write'), link(main, 'OUT'), PART_DX);
    return { elements: [...before, read, main, write], inputs: { IN: ref(main, 'IN1') }, outputs: { Q: { passThrough: 'IN' } }, defaults };
  },
  decode(main, parts, ctx, type) {
    if (type === 'COIL') {
      if (main.kind !== 'outVariable' || main.negated) return shape(ctx, main, 'a COIL is an outVariable writing its address');
      return decoded({ address: main.expression }, [[pinKey(main.localId, null), 'IN']], []);
    }
    const reset = type === 'RESET_COIL';
    const fn = reset ? 'AND' : 'OR';
    if (main.kind !== 'block' || main.typeName.toUpperCase() !== fn) return shape(ctx, main, `a ${type} is an ${fn} of IN and its address, written back`);
    const read = part(ctx, main, parts, 'read', 'inVariable') as FbdInVariable | undefined;
    const write = part(ctx, main, parts, 'write', 'outVariable') as FbdOutVariable | undefined;
    if (!read || !write || !fedBy(ctx, main, inputPin(main, 'IN2'), read, false) || !fedBy(ctx, write, write.input, main, false)) return undefined;
    const in1 = inputPin(main, 'IN1');
    if (!in1 || in1.negated !== reset) return shape(ctx, main, `${describe(main)} must take IN1 ${reset ? 'negated' : 'as it is'}`);
    if (write.expression.trim().toUpperCase() !== read.expression.trim().toUpperCase()) return shape(ctx, write, `${type} must write the address it reads (${read.expression})`);
    return decoded({ address: read.expression }, [[pinKey(main.localId, 'IN1'), 'IN']], [], [pinKey(main.localId, 'IN2'), pinKey(write.localId, null)]);
  },
};

const sizeOf = (address: string): Size | undefined => {
  const r = parseAddress(address);
  return r.ok ? r.value.size : undefined;
};

const wordIn: Codec = {
  encode(b, ctx) {
    const { address, signed } = b.params as { address: string; signed: boolean };
    const typeName = WORD_IN_CONVERSIONS[sizeOf(address) as Exclude<Size, 'X'>][signed ? 1 : 0];
    const read = inVar(ctx, b, address, false, partMeta(b, 'read'), -PART_DX);
    const main = fbdBlock(ctx, b, typeName, [pin('IN', false, link(read))], ['OUT']);
    return { elements: [read, main], inputs: {}, outputs: { OUT: ref(main, 'OUT') }, defaults: {} };
  },
  decode(main, parts, ctx) {
    const entry = main.kind === 'block' ? Object.entries(WORD_IN_CONVERSIONS).find(([, names]) => names.includes(main.typeName.toUpperCase())) : undefined;
    if (main.kind !== 'block' || !entry) return shape(ctx, main, 'a WORD_IN is a BYTE_/WORD_/DWORD_TO_ integer conversion of its address');
    const read = part(ctx, main, parts, 'read', 'inVariable') as FbdInVariable | undefined;
    if (!read || !fedBy(ctx, main, inputPin(main, 'IN'), read, false)) return undefined;
    const size = sizeOf(read.expression);
    if (size !== undefined && size !== entry[0]) return shape(ctx, main, `${main.typeName} does not read a %?${size} address (${read.expression})`);
    const signed = entry[1][1] === main.typeName.toUpperCase();
    return decoded({ address: read.expression, signed }, [], [[pinKey(main.localId, 'OUT'), 'OUT']], [pinKey(main.localId, 'IN')]);
  },
};

const wordOut: Codec = {
  encode(b, ctx) {
    const { address } = b.params as { address: string };
    const main = fbdBlock(ctx, b, WORD_OUT_FUNCTIONS[sizeOf(address) as Exclude<Size, 'X'>], [pin('IN')], ['OUT']);
    const write = outVar(ctx, b, address, partMeta(b, 'write'), link(main, 'OUT'), PART_DX);
    return { elements: [main, write], inputs: { IN: ref(main, 'IN') }, outputs: {}, defaults: {} };
  },
  decode(main, parts, ctx) {
    const size = main.kind === 'block' ? (Object.keys(WORD_OUT_FUNCTIONS) as Exclude<Size, 'X'>[]).find((s) => WORD_OUT_FUNCTIONS[s] === main.typeName.toUpperCase()) : undefined;
    if (main.kind !== 'block' || !size) return shape(ctx, main, 'a WORD_OUT is a CW_TO_BYTE / CW_TO_WORD / CW_TO_DWORD into its address');
    const write = part(ctx, main, parts, 'write', 'outVariable') as FbdOutVariable | undefined;
    if (!write || !fedBy(ctx, write, write.input, main, false) || !checkPins(ctx, main, ['IN'])) return undefined;
    const actual = sizeOf(write.expression);
    if (actual !== undefined && actual !== size) return shape(ctx, main, `${main.typeName} does not write a %?${actual} address (${write.expression})`);
    return decoded({ address: write.expression }, [[pinKey(main.localId, 'IN'), 'IN']], [], [pinKey(write.localId, null)]);
  },
};

function constant(bool: boolean): Codec {
  const port = bool ? 'Q' : 'OUT';
  return {
    encode(b, ctx) {
      const value = (b.params as { value: number | boolean }).value;
      const main = inVar(ctx, b, bool ? (value ? 'TRUE' : 'FALSE') : iecNumber(value as number), false, blockMeta(b));
      return { elements: [main], inputs: {}, outputs: { [port]: ref(main, null) }, defaults: {} };
    },
    decode(main, _parts, ctx, type) {
      if (main.kind !== 'inVariable') return shape(ctx, main, `a ${type} is an inVariable holding a literal`);
      const value = bool ? parseBool(main.expression) : parseIecNumber(main.expression) ?? parseTime(main.expression);
      if (value === undefined) {
        ctx.report([...ctx.pathOf(main), 'expression'], 'invalid_value', `"${main.expression}" is not a ${bool ? 'BOOL' : 'numeric'} literal`);
        return undefined;
      }
      return decoded({ value: bool ? value !== main.negated : value }, [], [[pinKey(main.localId, null), port]]);
    },
  };
}

function previous(bool: boolean): Codec {
  const port = bool ? 'Q' : 'OUT';
  return {
    encode(b, ctx): EncodedBlock {
      const name = ctx.nameOf(b);
      const initial = (b.params as { initial: boolean | number }).initial;
      ctx.declare({ name, type: bool ? 'BOOL' : 'LREAL', derived: false, initial: { simple: bool ? (initial ? 'TRUE' : 'FALSE') : iecReal(initial as number) } });
      const main = inVar(ctx, b, name, false, blockMeta(b));
      const dflt = ctx.connected(b, 'IN') ? undefined : defaultPart(ctx, b, bool ? 'FALSE' : '0.0');
      const remember = outVar(ctx, b, name, partMeta(b, 'remember'), dflt && link(dflt), PART_DX);
      return {
        elements: dflt ? [main, dflt, remember] : [main, remember],
        inputs: { IN: ref(remember, null) },
        outputs: { [port]: ref(main, null) },
        defaults: dflt ? { IN: ref(dflt, null) } : {},
      };
    },
    decode(main, parts, ctx, type) {
      if (main.kind !== 'inVariable' || main.negated) return shape(ctx, main, `a ${type} is an inVariable reading its previous-scan variable`);
      const name = main.expression.trim();
      const variable = ctx.variable(name);
      if (!variable || variable.derived) {
        ctx.report([...ctx.pathOf(main), 'expression'], 'undeclared_variable', `variable "${name}" is not declared as BOOL or LREAL in the program's interface`);
        return undefined;
      }
      const text = variable.initial && 'simple' in variable.initial ? variable.initial.simple : undefined;
      const initial = text === undefined ? (bool ? false : 0) : bool ? parseBool(text) : parseIecNumber(text);
      if (initial === undefined) {
        ctx.report([...ctx.pathOfVariable(variable), 'initialValue'], 'invalid_value', `initial value "${text}" of ${variable.name} is not a ${bool ? 'BOOL' : 'numeric'} literal`);
        return undefined;
      }
      const remember = parts.get('remember');
      if (!remember) return decoded({ initial }, [], [[pinKey(main.localId, null), port]]);
      if (remember.kind !== 'outVariable' || remember.expression.trim().toUpperCase() !== name.toUpperCase()) return shape(ctx, main, `the "remember" part of ${type} must be an outVariable writing ${name}`);
      return decoded({ initial }, [[pinKey(remember.localId, null), 'IN']], [[pinKey(main.localId, null), port]]);
    },
  };
}

const CODECS: Record<BlockType, Codec> = {
  NO_CONTACT: contact,
  NC_CONTACT: contact,
  COIL: coil,
  SET_COIL: coil,
  RESET_COIL: coil,
  ...(Object.fromEntries(STANDARD_FUNCTIONS.map((t) => [t, standardFunction(t)])) as Record<(typeof STANDARD_FUNCTIONS)[number], Codec>),
  ...(Object.fromEntries(STANDARD_FBS.map((t) => [t, standardFb(t)])) as Record<(typeof STANDARD_FBS)[number], Codec>),
  SPAN_MAP: spanFb(),
  WORD_IN: wordIn,
  WORD_OUT: wordOut,
  CONST: constant(false),
  CONST_BOOL: constant(true),
  PREV_BOOL: previous(true),
  PREV_NUM: previous(false),
};

/** The FBD codec of a block type. */
export function codecFor(type: BlockType): Codec {
  return CODECS[type];
}

/** Whether the exporter must name a block (an FB instance or a previous-scan variable). */
export function needsName(type: BlockType): boolean {
  return (STANDARD_FBS as readonly string[]).includes(type) || type === 'SPAN_MAP' || type === 'PREV_BOOL' || type === 'PREV_NUM';
}

/**
 * The block type of an element that carries no Cellwright data (a file from another tool):
 * standard blocks by type name, direct bit addresses as contacts and coils, literals as
 * constants. `undefined` when there is no unambiguous Cellwright block for it.
 */
export function inferBlockType(el: FbdElement): BlockType | undefined {
  if (el.kind === 'block') {
    const name = el.typeName.toUpperCase();
    if ((STANDARD_FBS as readonly string[]).includes(name) || (STANDARD_FUNCTIONS as readonly string[]).includes(name)) return name as BlockType;
    return name === SPAN_FB || name === LEGACY_SPAN_FB ? 'SPAN_MAP' : undefined;
  }
  // By its form only: an address out of range still reads as one, and the sheet validator
  // then says what is wrong with it.
  const address = /^\s*%[IQM]([XBWD])?\d+(\.\d+)?\s*$/i.exec(el.expression);
  const bit = address !== null && (address[1] ?? (address[2] ? 'X' : '')).toUpperCase() === 'X';
  if (el.kind === 'outVariable') return bit ? 'COIL' : undefined;
  if (address) return bit ? (el.negated ? 'NC_CONTACT' : 'NO_CONTACT') : undefined;
  if (parseBool(el.expression) !== undefined && !/^\s*[01]\s*$/.test(el.expression)) return 'CONST_BOOL';
  if (parseIecNumber(el.expression) !== undefined || parseTime(el.expression) !== undefined) return el.negated ? undefined : 'CONST';
  return undefined;
}
