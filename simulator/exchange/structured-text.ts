/**
 * Logic sheet → IEC 61131-3 Structured Text: one PROGRAM whose statements run in the order
 * the engine solves the sheet, so a technician can read the logic line by line and a PLC
 * that runs it every scan period does what the sheet does.
 *
 * Shape: VAR sections for the direct addresses (`IX0_0 AT %IX0.0 : BOOL;`), the standard
 * function block instances (presets as initial values, `t1 : TON := (PT := T#500ms);`), one
 * variable per block output, and the previous-scan variables; then one statement per block.
 * Contacts on %I and constants are written inline where they are used (an input never
 * changes during a scan); a contact on %Q or %M gets its own variable, because a coil later
 * in the scan may change the bit it read.
 *
 * Blocks without a standard counterpart become expressions with a comment: SPAN_MAP as its
 * formula, WORD_OUT as LINT_TO_WORD(LREAL_TO_LINT(…)), SET_COIL / RESET_COIL as IF … THEN,
 * PREV_BOOL / PREV_NUM as a variable assigned at the end of the scan.
 *
 * Types: BOOL wires are BOOL, numbers LREAL, times TIME, counter presets and counts INT
 * (IEC 61131-3 CTU/CTD/CTUD); a wire between different types is converted with the
 * standard `<FROM>_TO_<TO>` function.
 */
import { formatAddress, parseAddress, type Size } from '@/simulator/address/address';
import { blockPorts } from '@/simulator/plc/catalogue';
import type { LogicSheetInput, SheetBlock } from '@/simulator/plc/sheet-schema';
import { analyseSheet, type AnalysedSheet } from '@/simulator/plc/validate';
import type { Problem, Result } from '@/simulator/shared/result';
import { formatMember, presetMembers } from './block-codecs';
import { commentText, createNamer, formatTime, iecNumber, iecReal, plainDecimal, type Namer } from './iec-text';

/** Options of {@link sheetToStructuredText}. */
export type StructuredTextOptions = {
  /** Name of the PROGRAM (made into an IEC identifier); default `CellLogic`. */
  programName?: string;
  /** A line for the header comment, e.g. the cell's name. */
  title?: string;
};

/** IEC type of a value in the program; `LIT` is a numeric literal that adapts to where it goes. */
type StType = 'BOOL' | 'LREAL' | 'TIME' | 'INT' | 'LINT' | 'USINT' | 'SINT' | 'UINT' | 'DINT' | 'UDINT' | 'LIT';
type Value = { text: string; type: StType; literal?: number };

const INT_RANGE: Partial<Record<StType, [number, number]>> = { INT: [-32768, 32767], LINT: [-(2 ** 53), 2 ** 53] };
const ADDRESS_TYPE: Record<Size, string> = { X: 'BOOL', B: 'BYTE', W: 'WORD', D: 'DWORD' };
const WORD_IN_TYPE: Record<Exclude<Size, 'X'>, [StType, StType]> = { B: ['USINT', 'SINT'], W: ['UINT', 'INT'], D: ['UDINT', 'DINT'] };
const FB_TYPES = new Set(['TON', 'TOF', 'TP', 'CTU', 'CTD', 'CTUD', 'SR', 'RS', 'R_TRIG', 'F_TRIG']);
const COMPARE_OPS: Record<string, string> = { GT: '>', GE: '>=', EQ: '=', NE: '<>', LE: '<=', LT: '<' };

const addressOf = (b: SheetBlock): string | undefined => (b.params as { address?: string }).address;
const canonical = (address: string): string => {
  const r = parseAddress(address);
  return r.ok ? formatAddress(r.value) : address;
};
const isPrev = (b: SheetBlock) => b.type === 'PREV_BOOL' || b.type === 'PREV_NUM';
/** A contact that is just a read of an input bit: written inline where it is used. */
const isInlineRead = (a: AnalysedSheet, i: number) => {
  const b = a.sheet.blocks[i];
  return (b.type === 'NO_CONTACT' || b.type === 'NC_CONTACT') && !a.drivers[i].has('IN') && canonical(addressOf(b) as string).startsWith('%I');
};
const isConstant = (b: SheetBlock) => b.type === 'CONST' || b.type === 'CONST_BOOL';

/** Wraps an operand in parentheses unless it is a name, a member, an unsigned literal or one call. */
function operand(text: string): string {
  if (/^[A-Za-z0-9_.#]+$/.test(text)) return text;
  const call = /^[A-Za-z_][A-Za-z0-9_]*\(/.exec(text);
  if (call) {
    // A call only when the parenthesis it opens closes at the very end.
    let depth = 0;
    for (let k = call[0].length - 1; k < text.length; k++) {
      depth += text[k] === '(' ? 1 : text[k] === ')' ? -1 : 0;
      if (depth === 0) return k === text.length - 1 ? text : `(${text})`;
    }
  }
  return `(${text})`;
}

/**
 * Exports a logic sheet as an IEC 61131-3 Structured Text PROGRAM (see the module comment
 * for its shape). Fails with the sheet's own problems when it does not validate.
 */
export function sheetToStructuredText(sheet: LogicSheetInput, options: StructuredTextOptions = {}): Result<string, Problem> {
  const analysed = analyseSheet(sheet);
  if (!analysed.ok) return analysed;
  const a = analysed.value;
  const blocks = a.sheet.blocks;
  const programName = createNamer().name(options.programName ?? 'CellLogic');
  const namer: Namer = createNamer([programName]);
  // Blocks whose statement names no variable of their own (inline reads, constants, writes) get no name.
  const unnamed = (b: SheetBlock, i: number) => isInlineRead(a, i) || isConstant(b) || ['COIL', 'SET_COIL', 'RESET_COIL', 'WORD_OUT'].includes(b.type);
  const names = blocks.map((b, i) => (unnamed(b, i) ? '' : namer.name(b.id)));

  // Direct addresses, one located variable each (two spellings of one address share it).
  const addressVars = new Map<string, { name: string; type: string; users: string[] }>();
  for (const b of blocks) {
    const address = addressOf(b);
    if (address === undefined) continue;
    const key = canonical(address);
    const entry = addressVars.get(key) ?? { name: namer.name(key.slice(1).replace('.', '_')), type: ADDRESS_TYPE[key[2] as Size], users: [] };
    // Contacts on %I are written inline, so this comment is where their labels show.
    entry.users.push(b.label === undefined ? b.id : `${b.id} (${b.label})`);
    addressVars.set(key, entry);
  }
  const addressVar = (b: SheetBlock) => (addressVars.get(canonical(addressOf(b) as string)) as { name: string }).name;
  const notes = new Set<string>();

  const valueOf = (i: number, port: string): Value => {
    const b = blocks[i];
    switch (b.type) {
      case 'NO_CONTACT':
      case 'NC_CONTACT':
        if (isInlineRead(a, i)) return { text: `${b.type === 'NC_CONTACT' ? 'NOT ' : ''}${addressVar(b)}`, type: 'BOOL' };
        return { text: names[i], type: 'BOOL' };
      case 'COIL':
      case 'SET_COIL':
      case 'RESET_COIL':
        // A coil passes its power flow on: Q is whatever drives IN.
        return input(i, 'IN', 'BOOL');
      case 'CONST':
        return { text: iecNumber(b.params.value), type: 'LIT', literal: b.params.value };
      case 'CONST_BOOL':
        return { text: b.params.value ? 'TRUE' : 'FALSE', type: 'BOOL' };
      case 'WORD_IN':
        return { text: names[i], type: WORD_IN_TYPE[canonical(b.params.address)[2] as Exclude<Size, 'X'>][b.params.signed ? 1 : 0] };
      default: {
        if (FB_TYPES.has(b.type)) {
          const type: StType = port === 'CV' ? 'INT' : port === 'ET' ? 'TIME' : 'BOOL';
          return { text: `${names[i]}.${port}`, type };
        }
        const spec = blockPorts(b.type, b.params as Record<string, unknown>).outputs[0];
        return { text: names[i], type: spec.type === 'BOOL' ? 'BOOL' : 'LREAL' };
      }
    }
  };

  const convert = (v: Value, to: StType): string => {
    if (v.type === to) return v.text;
    if (v.type === 'LIT') {
      const x = v.literal as number;
      const range = INT_RANGE[to];
      if (to === 'LREAL') return iecReal(x);
      if (range && Number.isInteger(x) && x >= range[0] && x <= range[1]) return iecNumber(x);
      if (to === 'TIME' && x >= 0) return formatTime(x);
      if (to === 'TIME') notes.add('time');
      return `LREAL_TO_${to}(${iecReal(x)})`;
    }
    if (v.type === 'TIME' || to === 'TIME') notes.add('time');
    return `${v.type}_TO_${to}(${v.text})`;
  };

  /** The expression feeding input `port` of block `i`, in type `to`; an unwired input is its default. */
  function input(i: number, port: string, to: StType): Value {
    const d = a.drivers[i].get(port);
    if (d) return { text: convert(valueOf(d.block, d.port), to), type: to };
    return { text: to === 'BOOL' ? 'FALSE' : to === 'LREAL' ? '0.0' : to === 'TIME' ? 'T#0ms' : '0', type: to };
  }
  const bool = (i: number, port: string) => input(i, port, 'BOOL').text;
  const real = (i: number, port: string) => input(i, port, 'LREAL').text;

  const trailing = (b: SheetBlock, name: string, extra?: string): string => {
    // The block id, whenever the statement does not already show it, leads back to the canvas.
    const id = name !== b.id ? commentText(b.id) : '';
    const label = commentText(b.label ?? '');
    const bits = [id && label ? `${id}: ${label}` : id || label, commentText(extra ?? '')].filter((t) => t !== '');
    return bits.length > 0 ? ` (* ${bits.join('; ')} *)` : '';
  };

  // ---- statements, in the engine's order
  const body: string[] = [];
  for (const i of a.order) {
    const b = blocks[i];
    const name = names[i];
    const say = (statement: string, extra?: string) => body.push(statement + trailing(b, name, extra));
    switch (b.type) {
      case 'NO_CONTACT':
      case 'NC_CONTACT': {
        if (isInlineRead(a, i)) break;
        const bit = `${b.type === 'NC_CONTACT' ? 'NOT ' : ''}${addressVar(b)}`;
        say(a.drivers[i].has('IN') ? `${name} := ${operand(bool(i, 'IN'))} AND ${bit};` : `${name} := ${bit};`);
        break;
      }
      case 'COIL':
        say(`${addressVar(b)} := ${bool(i, 'IN')};`);
        break;
      case 'SET_COIL':
      case 'RESET_COIL': {
        const set = b.type === 'SET_COIL';
        if (!a.drivers[i].has('IN')) say(`(* ${commentText(b.type)} ${b.params.address}: nothing wired to IN, never ${set ? 'sets' : 'resets'} the bit *)`);
        else say(`IF ${bool(i, 'IN')} THEN ${addressVar(b)} := ${set ? 'TRUE' : 'FALSE'}; END_IF;`, `${set ? 'set' : 'reset'} coil`);
        break;
      }
      case 'AND':
      case 'OR':
      case 'XOR': {
        const ins = blockPorts(b.type, b.params).inputs.map((p) => operand(bool(i, p.name)).replace(/^\((NOT [A-Za-z0-9_.]+)\)$/, '$1'));
        say(`${name} := ${ins.join(` ${b.type} `)};`);
        break;
      }
      case 'NOT':
        say(`${name} := NOT ${operand(bool(i, 'IN'))};`);
        break;
      case 'GT':
      case 'GE':
      case 'EQ':
      case 'NE':
      case 'LE':
      case 'LT':
        say(`${name} := ${operand(real(i, 'IN1'))} ${COMPARE_OPS[b.type]} ${operand(real(i, 'IN2'))};`);
        break;
      case 'MOVE':
        say(`${name} := ${real(i, 'IN')};`);
        break;
      case 'SEL':
        say(`${name} := SEL(G := ${bool(i, 'G')}, IN0 := ${real(i, 'IN0')}, IN1 := ${real(i, 'IN1')});`);
        break;
      case 'LIMIT':
        say(`${name} := LIMIT(MN := ${real(i, 'MN')}, IN := ${real(i, 'IN')}, MX := ${real(i, 'MX')});`);
        break;
      case 'SPAN_MAP': {
        const { outMin, outMax, clamp } = b.params;
        // The raw span as the engine runs it (the block's own, or that of the word it reads).
        const { inMin, inMax } = a.spans[i] as { inMin: number; inMax: number };
        // The engine's formula, term by term, with zero terms left out (they change nothing).
        const x = operand(real(i, 'IN'));
        const shifted = inMin === 0 ? x : `(${x} - ${operand(iecReal(inMin))})`;
        const scaled = `${shifted} * ${operand(iecReal(outMax - outMin))} / ${operand(iecReal(inMax - inMin))}`;
        const y = outMin === 0 ? scaled : `${iecReal(outMin)} + ${scaled}`;
        const lo = iecReal(Math.min(outMin, outMax));
        const hi = iecReal(Math.max(outMin, outMax));
        say(clamp ? `${name} := LIMIT(MN := ${lo}, IN := ${y}, MX := ${hi});` : `${name} := ${y};`, `SPAN_MAP ${iecReal(inMin)}..${iecReal(inMax)} -> ${iecReal(outMin)}..${iecReal(outMax)}${clamp ? ', clamped' : ''}`);
        break;
      }
      case 'WORD_IN': {
        const size = canonical(b.params.address)[2] as Exclude<Size, 'X'>;
        const bits = ADDRESS_TYPE[size];
        say(`${name} := ${bits}_TO_${WORD_IN_TYPE[size][b.params.signed ? 1 : 0]}(${addressVar(b)});`);
        break;
      }
      case 'WORD_OUT': {
        const bits = ADDRESS_TYPE[canonical(b.params.address)[2] as Size];
        const value = input(i, 'IN', 'LINT').text;
        if (value.startsWith('LREAL_TO_LINT(')) notes.add('word');
        say(`${addressVar(b)} := LINT_TO_${bits}(${value});`, `WORD_OUT: low ${bits === 'BYTE' ? 8 : bits === 'WORD' ? 16 : 32} bits of the whole number`);
        break;
      }
      case 'CONST':
      case 'CONST_BOOL':
      case 'PREV_BOOL':
      case 'PREV_NUM':
        break;
      default: {
        // A standard function block: a call with the wired inputs (unwired ones keep their value).
        const args = blockPorts(b.type, b.params as Record<string, unknown>)
          .inputs.filter((p) => a.drivers[i].has(p.name))
          .map((p) => `${p.name} := ${input(i, p.name, p.type === 'BOOL' ? 'BOOL' : p.name === 'PV' ? 'INT' : 'TIME').text}`);
        if (b.type.startsWith('CT')) notes.add('counter');
        say(`${name}(${args.join(', ')});`);
      }
    }
  }

  // ---- previous-scan values: written after everything else has been solved
  const prevs = blocks.map((b, i) => i).filter((i) => isPrev(blocks[i]));
  const epilogue: string[] = [];
  const nextNames = new Map<number, string>();
  const twoPhase = prevs.some((i) => {
    const d = a.drivers[i].get('IN');
    return d !== undefined && isPrev(blocks[d.block]);
  });
  for (const i of prevs) {
    const type: StType = blocks[i].type === 'PREV_BOOL' ? 'BOOL' : 'LREAL';
    const text = input(i, 'IN', type).text;
    if (!twoPhase) epilogue.push(`${names[i]} := ${text};`);
    else {
      nextNames.set(i, namer.name(`${names[i]}_next`));
      epilogue.push(`${nextNames.get(i)} := ${text};`);
    }
  }
  if (twoPhase) for (const i of prevs) epilogue.push(`${names[i]} := ${nextNames.get(i)};`);

  // ---- declarations
  const decl: string[] = [];
  const section = (comment: string, lines: string[]) => {
    if (lines.length > 0) decl.push('VAR', `    (* ${comment} *)`, ...lines.map((l) => `    ${l}`), 'END_VAR');
  };
  const withComment = (line: string, b: SheetBlock, name: string) => line + trailing(b, name);
  section(
    'Direct addresses: %I inputs, %Q outputs, %M memory',
    [...addressVars].map(([address, v]) => `${v.name} AT ${address} : ${v.type}; (* ${commentText(v.users.join(', '))} *)`),
  );
  section(
    'Function block instances; presets are their initial values',
    blocks.flatMap((b, i) => {
      if (!FB_TYPES.has(b.type)) return [];
      const members = presetMembers(b.type).map((m) => `${m.member} := ${formatMember(m.kind, (b.params as Record<string, unknown>)[m.param])}`);
      return [withComment(`${names[i]} : ${b.type}${members.length > 0 ? ` := (${members.join(', ')})` : ''};`, b, names[i])];
    }),
  );
  section(
    'Block outputs, one per block on the sheet',
    blocks.flatMap((b, i) => {
      if (names[i] === '' || FB_TYPES.has(b.type) || isPrev(b)) return [];
      return [withComment(`${names[i]} : ${valueOf(i, blockPorts(b.type, b.params as Record<string, unknown>).outputs[0].name).type};`, b, names[i])];
    }),
  );
  section(
    'Previous-scan values (PREV_BOOL / PREV_NUM): read during the scan, written at its end',
    prevs.flatMap((i) => {
      const b = blocks[i];
      const type = b.type === 'PREV_BOOL' ? 'BOOL' : 'LREAL';
      const initial = (b.params as { initial: boolean | number }).initial;
      const initialText = typeof initial === 'boolean' ? (initial ? 'TRUE' : 'FALSE') : iecReal(initial);
      const next = nextNames.get(i);
      return [withComment(`${names[i]} : ${type} := ${initialText};`, b, names[i]), ...(next ? [`${next} : ${type};`] : [])];
    }),
  );

  const header = [
    options.title ? commentText(options.title) : 'Cellwright logic sheet',
    'Exported from Cellwright as IEC 61131-3 Structured Text.',
    `Run ${programName} from a cyclic task every ${plainDecimal(a.sheet.scanPeriodMs)} ms (the sheet's scan period).`,
    'Statements follow the order in which Cellwright solves the sheet.',
    ...(notes.has('time') ? ['Cellwright counts a TIME as milliseconds: check that TIME_TO_LREAL / LREAL_TO_TIME do so on your PLC.'] : []),
    ...(notes.has('counter') ? ['Counter presets and counts are INT; a number wired into PV is rounded to INT.'] : []),
    ...(notes.has('word') ? ['WORD_OUT rounds halves upward and writes 0 for a non-finite value; LREAL_TO_LINT may round halves differently.'] : []),
  ];
  const lines = [
    `(* ${header.join('\n   ')} *)`,
    `PROGRAM ${programName}`,
    ...decl,
    '',
    ...(body.length > 0 ? body : ['(* no statements: the sheet has no blocks that act *)']),
    ...(epilogue.length > 0 ? ['', '(* Remember this scan\'s values for the next scan *)', ...epilogue] : []),
    'END_PROGRAM',
    '',
  ];
  return { ok: true, value: lines.join('\n') };
}
