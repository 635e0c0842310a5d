/**
 * Analog signals: linear scaling of 0–10 V and 4–20 mA to engineering units, module raw
 * counts, and NAMUR NE 43 signal bands for 4–20 mA loops.
 */
import type { Problem, Result } from '@/simulator/shared/result';

/**
 * Linear map of `x` from [inMin, inMax] onto [outMin, outMax] (no clamping; values outside
 * the input span extrapolate). inMin must differ from inMax.
 */
export function scaleLinear(x: number, inMin: number, inMax: number, outMin: number, outMax: number): number {
  if (inMin === inMax) throw new RangeError('scaleLinear: input span is empty (inMin === inMax)');
  return outMin + ((x - inMin) * (outMax - outMin)) / (inMax - inMin);
}

/** An analog signal range. */
export type SignalRange = '0-10V' | '4-20mA';
/** Span of each signal range, in V or mA. */
export const SIGNAL_SPANS: Readonly<Record<SignalRange, { lo: number; hi: number; unit: 'V' | 'mA' }>> = Object.freeze({
  '0-10V': { lo: 0, hi: 10, unit: 'V' },
  '4-20mA': { lo: 4, hi: 20, unit: 'mA' },
});

/** Engineering value of a 4–20 mA signal on the span [lo, hi] (4 mA → lo, 20 mA → hi). */
export function currentToEngineering(mA: number, lo: number, hi: number): number {
  return scaleLinear(mA, 4, 20, lo, hi);
}

/** Engineering value of a 0–10 V signal on the span [lo, hi]. */
export function voltageToEngineering(volts: number, lo: number, hi: number): number {
  return scaleLinear(volts, 0, 10, lo, hi);
}

/** Signal (V or mA) that represents an engineering value on [lo, hi] in the given range. */
export function engineeringToSignal(value: number, range: SignalRange, lo: number, hi: number): number {
  const s = SIGNAL_SPANS[range];
  return scaleLinear(value, lo, hi, s.lo, s.hi);
}

/**
 * How an analog input module reports a reading in its word (the module's declared format):
 * - `unsigned`: the converter's code, 0 at the bottom of the nominal span and 2^bits − 1 at
 *   the top (a 16-bit module: 0..65535);
 * - `signed`: 0 at the bottom and 2^(bits−1) − 1 at the top (a 16-bit module: 0..32767), the
 *   sign bit left for readings below the span, down to −2^(bits−1).
 * Right-aligned binary codes of an n-bit converter, as common practice (any data-acquisition
 * text); the word carries them as 16-bit two's complement.
 */
export type CountFormat = 'unsigned' | 'signed';

/** How an analog input module turns a signal into a number. */
export type AnalogModuleSpec = {
  range: SignalRange;
  /** Converter resolution, 8..16 bits. */
  bits: number;
  /** The count format (default `unsigned`). */
  format?: CountFormat;
};

/**
 * The counts a module reports: 0 at the bottom of the nominal span, `spanMax` at its top,
 * and nothing below `min` or above `max` — the converter saturates there, so a signal beyond
 * its reach reads `min` (the underflow reading) or `max` (the overflow reading), never a
 * wrapped word.
 */
export function countRange(spec: Pick<AnalogModuleSpec, 'bits' | 'format'>): { min: number; max: number; spanMax: number } {
  if (spec.format === 'signed') {
    const top = 2 ** (spec.bits - 1) - 1;
    return { min: -(2 ** (spec.bits - 1)), max: top, spanMax: top };
  }
  const top = 2 ** spec.bits - 1;
  return { min: 0, max: top, spanMax: top };
}

/**
 * Raw counts for a signal: its fraction of the nominal span, quantised to the format's
 * steps (`spanMax` steps over the span), saturating at the format's limits. A signal that is
 * not a number (no reading at all) reads the underflow value.
 */
export function signalToCounts(signal: number, spec: AnalogModuleSpec): number {
  const s = SIGNAL_SPANS[spec.range];
  const { min, max, spanMax } = countRange(spec);
  if (Number.isNaN(signal)) return min;
  const code = Math.round(((signal - s.lo) / (s.hi - s.lo)) * spanMax);
  return Math.min(max, Math.max(min, code));
}

/** Signal (V or mA) for raw counts: the inverse of {@link signalToCounts} without quantisation. */
export function countsToSignal(counts: number, spec: AnalogModuleSpec): number {
  const s = SIGNAL_SPANS[spec.range];
  return scaleLinear(counts, 0, countRange(spec).spanMax, s.lo, s.hi);
}

/** NAMUR NE 43 reading of a 4–20 mA loop current. */
export type Ne43Status =
  | 'normal'
  | 'under_range'
  | 'over_range'
  | 'failed_low'
  | 'failed_high'
  | 'indeterminate_low'
  | 'indeterminate_high';

/**
 * NAMUR NE 43 bands (thresholds 3.6 / 3.8 / 20.5 / 21.0 mA, from memory):
 * - 4.0 ≤ I ≤ 20.0 mA: `normal` measurement;
 * - 3.8 ≤ I < 4.0: `under_range`; 20.0 < I ≤ 20.5: `over_range` (still a valid measurement);
 * - I ≤ 3.6: `failed_low`; I ≥ 21.0: `failed_high` (a transmitter's failure signal, or a lost loop);
 * - 3.6 < I < 3.8 and 20.5 < I < 21.0 lie in neither band: `indeterminate_low` /
 *   `indeterminate_high` (NE 43 leaves them undefined; receivers should not trust them).
 */
export function ne43Status(mA: number): Ne43Status {
  if (Number.isNaN(mA)) return 'failed_low';
  if (mA <= 3.6) return 'failed_low';
  if (mA < 3.8) return 'indeterminate_low';
  if (mA < 4) return 'under_range';
  if (mA <= 20) return 'normal';
  if (mA <= 20.5) return 'over_range';
  if (mA < 21) return 'indeterminate_high';
  return 'failed_high';
}

/** True when an NE 43 status carries a usable measurement (normal, under- or over-range). */
export function ne43Valid(status: Ne43Status): boolean {
  return status === 'normal' || status === 'under_range' || status === 'over_range';
}

/** Encodings of a word point (grouped discrete points read as one number). */
export type WordEncoding = 'binary' | 'bcd' | 'gray';

function badWidth(bits: number): Problem | null {
  return Number.isInteger(bits) && bits >= 1 && bits <= 16
    ? null
    : { path: ['bits'], code: 'word_width', message: `a word point has 1..16 bits, not ${bits}` };
}

/**
 * Encodes a non-negative integer into a word of `bits` bits (≤ 16): plain binary, BCD
 * (one decimal digit per 4 bits, so 1234 → 0x1234), or reflected binary Gray code
 * (g = n XOR (n >> 1), so 5 → 0b0111). A value that does not fit is an error.
 */
export function encodeWord(value: number, encoding: WordEncoding, bits: number): Result<number, Problem> {
  const w = badWidth(bits);
  if (w) return { ok: false, errors: [w] };
  if (!Number.isInteger(value) || value < 0) {
    return { ok: false, errors: [{ path: ['value'], code: 'word_value', message: `a word point holds a non-negative integer, not ${value}` }] };
  }
  if (encoding !== 'bcd' && value >= 2 ** bits) {
    return { ok: false, errors: [{ path: ['value'], code: 'word_overflow', message: `${value} does not fit in ${bits} bits as ${encoding}` }] };
  }
  let word: number;
  if (encoding === 'bcd') {
    word = 0;
    let rest = value;
    let shift = 0;
    do {
      word += (rest % 10) * 2 ** shift;
      rest = Math.floor(rest / 10);
      shift += 4;
    } while (rest > 0);
  } else if (encoding === 'gray') {
    word = value ^ (value >>> 1);
  } else word = value;
  if (word >= 2 ** bits) {
    return {
      ok: false,
      errors: [{ path: ['value'], code: 'word_overflow', message: `${value} does not fit in ${bits} bits as ${encoding}` }],
    };
  }
  return { ok: true, value: word };
}

/**
 * Decodes a word of `bits` bits. A BCD word with a nibble above 9 is an error; bits above
 * the width are an error for every encoding.
 */
export function decodeWord(word: number, encoding: WordEncoding, bits: number): Result<number, Problem> {
  const w = badWidth(bits);
  if (w) return { ok: false, errors: [w] };
  if (!Number.isInteger(word) || word < 0 || word >= 2 ** bits) {
    return { ok: false, errors: [{ path: ['word'], code: 'word_value', message: `${word} is not a ${bits}-bit word` }] };
  }
  if (encoding === 'bcd') {
    let value = 0;
    let scale = 1;
    for (let rest = word; rest > 0; rest >>>= 4) {
      const digit = rest & 0xf;
      if (digit > 9) {
        return { ok: false, errors: [{ path: ['word'], code: 'bcd_digit', message: `0x${word.toString(16)} has a BCD digit above 9` }] };
      }
      value += digit * scale;
      scale *= 10;
    }
    return { ok: true, value };
  }
  if (encoding === 'gray') {
    let n = word;
    for (let shift = word >>> 1; shift > 0; shift >>>= 1) n ^= shift;
    return { ok: true, value: n };
  }
  return { ok: true, value: word };
}
