/**
 * IEC 61131-3 literals and identifiers. Literal forms are from memory of IEC 61131-3 (3rd
 * edition): based integers `16#FF`, `_` between digits, typed literals `LREAL#2.5`, real
 * literals with a decimal point, durations `T#1h2m3s4ms` with a fraction only in the last
 * part; identifiers case-insensitive, without `__` or a trailing `_`.
 */
import { describe, expect, it } from 'vitest';
import { MAX_TIME_MS } from '@/simulator/plc/sheet-schema';
import { commentText, createNamer, formatTime, iecNumber, iecReal, isAttributeSafe, parseBool, parseIecNumber, parseTime, plainDecimal } from './iec-text';

describe('numbers', () => {
  it('writes plain decimals that read back exactly, -0 included', () => {
    expect([1e21, 1.5e-7, -2.5e22, 123.456].map(plainDecimal)).toEqual(['1000000000000000000000', '0.00000015', '-25000000000000000000000', '123.456']);
    expect(Object.is(Number(plainDecimal(-0)), -0)).toBe(true);
    for (const x of [1e21, 1.5e-7, -1.2345678901234567e-300, Number.MAX_VALUE, Number.MIN_VALUE, 0.1 + 0.2]) expect(Number(plainDecimal(x))).toBe(x);
  });

  it('writes real literals with a decimal point and integers plainly', () => {
    expect([100, 1e21, 1.5e-7, -0, 2.5].map(iecReal)).toEqual(['100.0', '1.0E+21', '1.5E-7', '-0.0', '2.5']);
    expect([4095, -5, 2.5, -0].map(iecNumber)).toEqual(['4095', '-5', '2.5', '-0.0']);
  });

  it('reads decimal, real, based and typed literals; refuses anything else', () => {
    const read = ['16#FF', '2#1010_1010', '8#17', '1_000', 'LREAL#2.5', 'INT#-3', '1.0E+21', '-0.0', '+4'].map(parseIecNumber);
    expect(read).toEqual([255, 170, 15, 1000, 2.5, -3, 1e21, -0, 4]);
    expect(['abc', '16#FG', '8#9', '1__0', '1.', '.5', '', 'T#1s', '1e400'].map(parseIecNumber)).toEqual(Array(9).fill(undefined));
  });

  it('reads BOOL literals', () => {
    expect(['TRUE', 'false', 'BOOL#1', 'bool#0', 'yes'].map(parseBool)).toEqual([true, false, true, false, undefined]);
  });
});

describe('durations', () => {
  it('writes whole milliseconds in units and fractions in ms', () => {
    // 1 d + 1 h + 1 min + 1 s + 1 ms = 86,400,000 + 3,600,000 + 60,000 + 1,000 + 1.
    expect([0, 100, 1500, 90_061_001, 2.5].map(formatTime)).toEqual(['T#0ms', 'T#100ms', 'T#1s500ms', 'T#1d1h1m1s1ms', 'T#2.5ms']);
  });

  it('reads duration literals and refuses malformed ones', () => {
    expect(['T#1s500ms', 'TIME#1h', 't#2.5ms', 'T#1_000ms', 'T#-5ms', 'T#1.5s'].map(parseTime)).toEqual([1500, 3_600_000, 2.5, 1000, -5, 1500]);
    expect(['T#1m1h', 'T#1.5s2ms', 'T#', '1s', 'T#5x', 'T#1s1s'].map(parseTime)).toEqual(Array(6).fill(undefined));
  });

  it('round-trips every preset the schema allows, up to MAX_TIME_MS', () => {
    for (const ms of [0, 1, 999, 1000, 59_999, 3_600_001, 0.25, 1e-7, MAX_TIME_MS]) expect(parseTime(formatTime(ms))).toBe(ms);
  });
});

describe('identifiers and text', () => {
  it('makes unique IEC identifiers from block ids, case-insensitively', () => {
    const n = createNamer(['CellLogic']);
    const names = ['Start', 'start', 'if', '9lives', 'a..b', 'x__y', 'WORD_TO_INT', 'celllogic', '---', 'T'].map((id) => n.name(id));
    expect(names).toEqual(['Start', 'start_2', 'if_B', 'B_9lives', 'a_b', 'x_y', 'WORD_toINT', 'celllogic_2', 'B', 'T_B']);
    expect(n.has('START')).toBe(true);
  });

  it('keeps comments on one line without delimiters, control characters or lone surrogates', () => {
    expect(commentText(' a (* b *) c\nd\u0001e \ud800 😀 ')).toBe('a ( * b * ) c d e \ufffd 😀');
  });

  it('knows which text survives in an XML attribute', () => {
    expect(['plain', 'émoji 😀', '<&">'].map(isAttributeSafe)).toEqual([true, true, true]);
    expect(['tab\t', 'line\n', 'ctrl\u0001', 'lone \ud800'].map(isAttributeSafe)).toEqual([false, false, false, false]);
  });
});
