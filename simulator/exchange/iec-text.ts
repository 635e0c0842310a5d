/**
 * IEC 61131-3 textual pieces shared by the Structured Text writer and the XML exchange:
 * number, TIME and BOOL literals (written and read back exactly), identifiers made from
 * Cellwright block ids, and comment text.
 *
 * Literal syntax follows IEC 61131-3 (3rd edition) as recalled from memory: integer
 * literals with optional `_` between digits and `2#`/`8#`/`16#` bases; real literals need a
 * decimal point (`1.0E+21`, not `1E21`); typed literals such as `LREAL#2.5`; duration
 * literals `T#1h2m3s4ms` (or `TIME#…`) whose last part may carry a fraction (`T#2.5ms`).
 */

/** Milliseconds per IEC duration unit (from memory: d, h, m, s, ms, us, ns). */
const TIME_UNITS: Record<string, number> = { d: 86_400_000, h: 3_600_000, m: 60_000, s: 1000, ms: 1, us: 0.001, ns: 0.000_001 };

/**
 * A finite number as a plain decimal without an exponent (`1e21` → `1000000000000000000000`),
 * keeping `-0`. `Number()` of the result gives back the same double, because only the
 * decimal point of JavaScript's shortest round-trip digits is moved.
 */
export function plainDecimal(x: number): string {
  if (Object.is(x, -0)) return '-0';
  const s = String(x);
  const m = /^(-?)(\d)(?:\.(\d+))?e([+-]\d+)$/.exec(s);
  if (!m) return s;
  const [, sign, lead, frac = '', expText] = m;
  const digits = lead + frac;
  const exp = Number(expText);
  if (exp >= 0) {
    const intLen = 1 + exp;
    return sign + (digits.length <= intLen ? digits + '0'.repeat(intLen - digits.length) : `${digits.slice(0, intLen)}.${digits.slice(intLen)}`);
  }
  return `${sign}0.${'0'.repeat(-exp - 1)}${digits}`;
}

/** A finite number as an IEC literal: integers plain (`4095`, `-5`), others as reals (`2.5`, `1.0E-7`). */
export function iecNumber(x: number): string {
  if (Number.isInteger(x) && !Object.is(x, -0) && Math.abs(x) < 1e21) return String(x);
  return iecReal(x);
}

/** A finite number as an IEC real literal, always with a decimal point (`100.0`, `-0.0`, `1.5E+21`). */
export function iecReal(x: number): string {
  if (Object.is(x, -0)) return '-0.0';
  const s = String(x);
  const e = s.indexOf('e');
  if (e < 0) return s.includes('.') ? s : `${s}.0`;
  const mantissa = s.slice(0, e);
  return `${mantissa.includes('.') ? mantissa : `${mantissa}.0`}E${s.slice(e + 1)}`;
}

/** Elementary type prefixes a typed numeric literal may carry (`INT#5`, `LREAL#2.5`). */
const NUMERIC_TYPE_PREFIX = /^(?:SINT|INT|DINT|LINT|USINT|UINT|UDINT|ULINT|REAL|LREAL|BYTE|WORD|DWORD|LWORD)#/i;

/** Reads an IEC numeric literal (decimal, real, based, typed); `undefined` when it is not one. */
export function parseIecNumber(text: string): number | undefined {
  const t = text.trim().replace(NUMERIC_TYPE_PREFIX, '');
  const based = /^(2|8|16)#([0-9A-Fa-f](?:_?[0-9A-Fa-f])*)$/.exec(t);
  if (based) {
    const radix = Number(based[1]);
    const digits = based[2].replace(/_/g, '');
    if (![...digits].every((c) => parseInt(c, 16) < radix)) return undefined;
    return parseInt(digits, radix);
  }
  if (!/^[+-]?\d(?:_?\d)*(?:\.\d(?:_?\d)*)?(?:[eE][+-]?\d+)?$/.test(t)) return undefined;
  const n = Number(t.replace(/_/g, ''));
  return Number.isFinite(n) ? n : undefined;
}

/**
 * A non-negative duration in ms as an IEC TIME literal: whole ms split into units for a
 * reader (`T#1m30s`, `T#100ms`, `T#0ms`), a fractional value in ms (`T#2.5ms`) so that it
 * reads back exactly.
 */
export function formatTime(ms: number): string {
  if (!Number.isInteger(ms) || ms < 0) return `T#${plainDecimal(ms)}ms`;
  if (ms === 0) return 'T#0ms';
  let rest = ms;
  let out = '';
  for (const unit of ['d', 'h', 'm', 's', 'ms']) {
    const size = TIME_UNITS[unit];
    const count = Math.floor(rest / size);
    if (count > 0) out += `${count}${unit}`;
    rest -= count * size;
  }
  return `T#${out}`;
}

/** Reads an IEC TIME literal (`T#…`, `TIME#…`, any case, `_` separators, a leading `-`) as ms. */
export function parseTime(text: string): number | undefined {
  const m = /^(?:T|TIME)#(-)?(.+)$/i.exec(text.trim());
  if (!m) return undefined;
  const body = m[2].replace(/_/g, '').toLowerCase();
  const part = /(\d+(?:\.\d+)?)(ms|us|ns|d|h|m|s)/y;
  let total = 0;
  let at = 0;
  let last = Infinity;
  let sawFraction = false;
  while (at < body.length) {
    part.lastIndex = at;
    const p = part.exec(body);
    if (!p || sawFraction) return undefined;
    const size = TIME_UNITS[p[2]];
    // Units must run from large to small, each at most once.
    if (size >= last) return undefined;
    last = size;
    sawFraction = p[1].includes('.');
    total += Number(p[1]) * size;
    at = part.lastIndex;
  }
  if (at === 0) return undefined;
  return m[1] ? -total : total;
}

/** Reads an IEC BOOL literal (`TRUE`, `FALSE`, `BOOL#1`, `BOOL#0`, any case). */
export function parseBool(text: string): boolean | undefined {
  const t = text.trim().toUpperCase().replace(/^BOOL#/, '');
  if (t === 'TRUE' || t === '1') return true;
  if (t === 'FALSE' || t === '0') return false;
  return undefined;
}

/**
 * Words a generated identifier must not be (case-insensitive): ST keywords, elementary
 * types, and the standard blocks and functions the exporters call (from memory of
 * IEC 61131-3 Annex B / the keyword table).
 */
const RESERVED = new Set(
  (
    'ABS ACTION ACOS ADD AND ANY ARRAY AS ASIN AT ATAN BOOL BY BYTE CASE CHAR CLASS CONCAT CONFIGURATION CONSTANT COS CTD CTU CTUD ' +
    'DATE DATE_AND_TIME DELETE DINT DIV DO DT DWORD ELSE ELSIF EN END_ACTION END_CASE END_CLASS END_CONFIGURATION END_FOR ' +
    'END_FUNCTION END_FUNCTION_BLOCK END_IF END_INTERFACE END_METHOD END_NAMESPACE END_PROGRAM END_REPEAT END_RESOURCE END_STEP ' +
    'END_STRUCT END_TRANSITION END_TYPE END_VAR END_WHILE ENO EQ EXIT EXP EXPT EXTENDS F_EDGE F_TRIG FALSE FINAL FIND FOR FROM ' +
    'FUNCTION FUNCTION_BLOCK GE GT IF IMPLEMENTS INITIAL_STEP INSERT INT INTERFACE INTERNAL INTERVAL LD LDATE LDT LE LEFT LEN ' +
    'LIMIT LINT LN LOG LREAL LT LTIME LTOD LWORD MAX METHOD MID MIN MOD MOVE MUL MUX NAMESPACE NE NON_RETAIN NOT NULL OF ON OR ' +
    'OVERLAP OVERRIDE PRIORITY PRIVATE PROGRAM PROTECTED PUBLIC R_EDGE R_TRIG READ_ONLY READ_WRITE REAL REF REF_TO REPEAT ' +
    'REPLACE RESOURCE RETAIN RETURN RIGHT ROL ROR RS S1 SEL SHL SHR SIN SINGLE SINT SQRT SR STEP STRING STRUCT SUB SUPER TAN ' +
    'TASK THEN THIS TIME TIME_OF_DAY TO TOD TOF TON TP TRANSITION TRUE TRUNC TYPE UDINT UINT ULINT UNTIL USING USINT VAR ' +
    'VAR_ACCESS VAR_CONFIG VAR_EXTERNAL VAR_GLOBAL VAR_IN_OUT VAR_INPUT VAR_OUTPUT VAR_TEMP WCHAR WHILE WITH WORD WSTRING XOR ' +
    'T D TIME_TO_LREAL LREAL_TO_TIME CW_SPAN_MAP CW_SCALE CW_TO_BYTE CW_TO_WORD CW_TO_DWORD'
  )
    .split(' ')
    .map((w) => w.toUpperCase()),
);

/** Whether `name` may be declared: an IEC identifier (no `__`, no trailing `_`) that is not reserved. */
export function isUsableIdentifier(name: string): boolean {
  return /^[A-Za-z_][A-Za-z0-9_]*$/.test(name) && !name.includes('__') && !name.endsWith('_') && !RESERVED.has(name.toUpperCase()) && !/_TO_/i.test(name);
}

/**
 * Hands out unique IEC identifiers. IEC identifiers are case-insensitive (from memory,
 * IEC 61131-3 §6.1.2), so `Start` and `start` are one name: uniqueness is checked upper-cased.
 */
export type Namer = {
  /** A fresh identifier close to `base` (a Cellwright id or a description). */
  name(base: string): string;
  /** Whether `name` has been handed out. */
  has(name: string): boolean;
};

/** Creates a {@link Namer}; `taken` lists names already in use. */
export function createNamer(taken: Iterable<string> = []): Namer {
  const used = new Set<string>();
  for (const t of taken) used.add(t.toUpperCase());
  return {
    name(base: string) {
      let stem = base.replace(/[^A-Za-z0-9_]/g, '_').replace(/_+/g, '_').replace(/^_+|_+$/g, '');
      if (stem === '') stem = 'B';
      if (/^\d/.test(stem)) stem = `B_${stem}`;
      // `_TO_` is how conversion functions are named; a block id must not look like one.
      stem = stem.replace(/_TO_/gi, '_to');
      if (!isUsableIdentifier(stem)) stem = `${stem}_B`;
      let candidate = stem;
      for (let k = 2; used.has(candidate.toUpperCase()) || !isUsableIdentifier(candidate); k++) candidate = `${stem}_${k}`;
      used.add(candidate.toUpperCase());
      return candidate;
    },
    has(name: string) {
      return used.has(name.toUpperCase());
    },
  };
}

/**
 * Text safe inside an ST comment `(* … *)`: one line, no comment delimiters, no control
 * characters, and no lone surrogate (it could not be saved as UTF-8; U+FFFD stands in).
 */
export function commentText(text: string): string {
  return text
    .replace(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, '\ufffd')
    .replace(/[\u0000-\u001f\u007f]+/g, ' ')
    .replace(/\(\*/g, '( *')
    .replace(/\*\)/g, '* )')
    .trim();
}

/**
 * Whether text can sit in an XML attribute and come back unchanged from any conforming
 * parser: attribute-value normalisation turns tabs and line breaks into spaces, and XML 1.0
 * cannot carry other control characters or lone surrogates at all.
 */
export function isAttributeSafe(text: string): boolean {
  return /^[\u0020-\u007e\u00a0-\ud7ff\ue000-\ufffd\u{10000}-\u{10ffff}]*$/u.test(text);
}
