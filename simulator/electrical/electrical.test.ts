import { describe, expect, it } from 'vitest';
import {
  applyInvert,
  classifyDigitalInput,
  contactClosed,
  inputVolts,
  countsToSignal,
  currentToEngineering,
  decodeWord,
  encodeWord,
  engineeringToSignal,
  ne43Status,
  ne43Valid,
  scaleLinear,
  sensorDrivesInput,
  countRange,
  signalToCounts,
  supplyWithinTolerance,
  voltageToEngineering,
} from './index';

describe('IEC 61131-2 digital input types, 24 V DC', () => {
  // Limits from IEC 61131-2 (2007) table of current-sinking input types (from memory):
  // ON 15..30 V (type 1) or 11..30 V (types 2, 3); OFF -3..5 V; in between: transition.
  it('type 1', () => {
    expect(classifyDigitalInput(24, 1)).toBe('on');
    expect(classifyDigitalInput(15, 1)).toBe('on');
    expect(classifyDigitalInput(14.9, 1)).toBe('undefined');
    expect(classifyDigitalInput(5, 1)).toBe('off');
    expect(classifyDigitalInput(5.1, 1)).toBe('undefined');
    expect(classifyDigitalInput(-3, 1)).toBe('off');
    expect(classifyDigitalInput(30, 1)).toBe('on');
    expect(classifyDigitalInput(30.5, 1)).toBe('undefined');
  });
  it('types 2 and 3 switch on from 11 V', () => {
    expect(classifyDigitalInput(12, 1)).toBe('undefined');
    expect(classifyDigitalInput(12, 2)).toBe('on');
    expect(classifyDigitalInput(11, 3)).toBe('on');
    expect(classifyDigitalInput(10.9, 3)).toBe('undefined');
  });
  it('current thresholds: I_H min 2 / 6 / 2 mA, I_T min 0.5 / 2 / 1.5 mA (from memory)', () => {
    expect(classifyDigitalInput(24, 2, 5)).toBe('undefined'); // type 2 needs 6 mA for ON
    expect(classifyDigitalInput(24, 2, 6)).toBe('on');
    expect(classifyDigitalInput(24, 1, 0.4)).toBe('off'); // below I_T min reads OFF
    expect(classifyDigitalInput(24, 3, 1.5)).toBe('off');
  });
  it('supply tolerance 24 V −15 %/+20 % = 20.4..28.8 V (common practice, from memory)', () => {
    expect(supplyWithinTolerance(20.4)).toBe(true);
    expect(supplyWithinTolerance(20.3)).toBe(false);
    expect(supplyWithinTolerance(28.8)).toBe(true);
    expect(supplyWithinTolerance(28.9)).toBe(false);
  });
});

describe('contacts and wiring (IEC 60947-5-1; NC stop circuits: common practice)', () => {
  it('NO closes when actuated, NC opens when actuated', () => {
    expect(contactClosed('NO', false)).toBe(false);
    expect(contactClosed('NO', true)).toBe(true);
    expect(contactClosed('NC', false)).toBe(true);
    expect(contactClosed('NC', true)).toBe(false);
  });
  it('an open wire reads 0 V: NO looks released, NC looks pressed (fail to stop)', () => {
    expect(inputVolts(contactClosed('NO', true), 'ok', 'sinking')).toBe(24);
    expect(inputVolts(contactClosed('NO', true), 'open', 'sinking')).toBe(0);
    expect(inputVolts(contactClosed('NC', false), 'ok', 'sinking')).toBe(24);
    expect(inputVolts(contactClosed('NC', false), 'open', 'sinking')).toBe(0);
    expect(inputVolts(contactClosed('NC', true), 'short_to_24v', 'sinking')).toBe(24);
    expect(inputVolts(contactClosed('NO', true), 'short_to_0v', 'sinking')).toBe(0);
    // On a sourcing input the rails swap roles; a sagging supply delivers what it has.
    expect(inputVolts(false, 'short_to_0v', 'sourcing')).toBe(24);
    expect(inputVolts(true, 'ok', 'sinking', 12)).toBe(12);
  });
  it('invert flips the logical state', () => {
    expect(applyInvert(true, true)).toBe(false);
    expect(applyInvert(true, false)).toBe(true);
  });
});

describe('PNP/NPN sensors on sinking/sourcing inputs (common practice, any PLC textbook)', () => {
  it('matched pairs pass the signal', () => {
    expect(sensorDrivesInput('PNP', 'sinking')).toBe(true);
    expect(sensorDrivesInput('NPN', 'sourcing')).toBe(true);
  });
  it('a mismatch never drives the input (the sensor indicator still lights: see the sensor-type-mismatch card of the cell)', () => {
    expect(sensorDrivesInput('NPN', 'sinking')).toBe(false);
    expect(sensorDrivesInput('PNP', 'sourcing')).toBe(false);
  });
});

describe('analog scaling (linear 4–20 mA and 0–10 V: common practice)', () => {
  it('worked example: 12 mA on a 0–10 bar span is 5 bar', () => {
    // (12 − 4) / (20 − 4) × (10 − 0) + 0 = 8/16 × 10 = 5 bar
    expect(currentToEngineering(12, 0, 10)).toBe(5);
    expect(currentToEngineering(4, 0, 10)).toBe(0);
    expect(currentToEngineering(20, 0, 10)).toBe(10);
  });
  it('worked example: 2.5 V on a 0–10 V, −20..80 °C span is 5 °C', () => {
    // 2.5 / 10 × (80 − (−20)) + (−20) = 25 − 20 = 5 °C
    expect(voltageToEngineering(2.5, -20, 80)).toBe(5);
  });
  it('inverse and general linear map', () => {
    expect(engineeringToSignal(5, '4-20mA', 0, 10)).toBe(12);
    expect(scaleLinear(2048, 0, 4096, 0, 100)).toBe(50);
    expect(() => scaleLinear(1, 2, 2, 0, 1)).toThrow(RangeError);
  });
  it('raw counts at module resolution', () => {
    // 12-bit converter: 2^12 − 1 = 4095 steps; mid-span 0.5 × 4095 = 2047.5 → 2048.
    expect(signalToCounts(12, { range: '4-20mA', bits: 12 })).toBe(2048);
    expect(countsToSignal(2048, { range: '4-20mA', bits: 12 })).toBeCloseTo(12.0020, 4);
  });
});

describe('analog count formats: counts follow the declared format of the module and saturate', () => {
  // Right-aligned n-bit converter codes (common practice, any data-acquisition text):
  // unsigned 0..2^n − 1 over the span; signed 0..2^(n−1) − 1 with negatives below the span.
  it('a 16-bit unsigned module spans 0..65535: 12 mA is mid-scale, not capped at half scale', () => {
    const spec = { range: '4-20mA', bits: 16, format: 'unsigned' } as const;
    expect(countRange(spec)).toEqual({ min: 0, max: 65535, spanMax: 65535 });
    expect(signalToCounts(4, spec)).toBe(0);
    expect(signalToCounts(12, spec)).toBe(32768); // 0.5 × 65535 = 32767.5 → 32768
    expect(signalToCounts(20, spec)).toBe(65535);
  });

  it('a 16-bit signed module spans 0..32767 and reads below the span as negative counts', () => {
    const spec = { range: '4-20mA', bits: 16, format: 'signed' } as const;
    expect(countRange(spec)).toEqual({ min: -32768, max: 32767, spanMax: 32767 });
    expect(signalToCounts(12, spec)).toBe(16384); // 0.5 × 32767 = 16383.5 → 16384
    expect(signalToCounts(20, spec)).toBe(32767);
    expect(signalToCounts(3, spec)).toBe(-2048); // (3 − 4) / 16 × 32767 = −2047.9 → −2048
    expect(signalToCounts(0, spec)).toBe(-8192); // a lost loop: (0 − 4) / 16 × 32767 = −8191.75
  });

  it('converters saturate at their bit width instead of wrapping: the overflow and underflow readings', () => {
    const u12 = { range: '0-10V', bits: 12 } as const;
    expect(signalToCounts(24, u12)).toBe(4095); // a 0–10 V input shorted to 24 V: overflow reading
    expect(signalToCounts(-3, u12)).toBe(0); // below the span on an unsigned format: underflow reading
    expect(signalToCounts(Number.NaN, u12)).toBe(0);
    const s16 = { range: '4-20mA', bits: 16, format: 'signed' } as const;
    expect(signalToCounts(40, s16)).toBe(32767);
    expect(signalToCounts(-100, s16)).toBe(-32768);
    const u16 = { range: '4-20mA', bits: 16 } as const;
    expect(signalToCounts(22, u16)).toBe(65535); // NE 43 failure level on the high side: saturated
  });
});

describe('NAMUR NE 43 bands (3.6 / 3.8 / 20.5 / 21.0 mA, from memory)', () => {
  it('classifies each band and its edges', () => {
    expect(ne43Status(12)).toBe('normal');
    expect(ne43Status(4)).toBe('normal');
    expect(ne43Status(20)).toBe('normal');
    expect(ne43Status(3.9)).toBe('under_range');
    expect(ne43Status(3.8)).toBe('under_range');
    expect(ne43Status(20.5)).toBe('over_range');
    expect(ne43Status(3.6)).toBe('failed_low');
    expect(ne43Status(0)).toBe('failed_low'); // broken loop
    expect(ne43Status(21)).toBe('failed_high');
    expect(ne43Status(3.7)).toBe('indeterminate_low');
    expect(ne43Status(20.7)).toBe('indeterminate_high');
    expect(ne43Valid('under_range')).toBe(true);
    expect(ne43Valid('failed_low')).toBe(false);
  });
});

describe('word encodings', () => {
  const value = <T>(r: { ok: true; value: T } | { ok: false }) => (r.ok ? r.value : 'error');
  it('Gray code (reflected binary): 5 → 0111, 6 → 0101, 15 → 1000', () => {
    // g = n XOR (n >> 1): standard reflected binary Gray code (any digital logic text).
    expect(value(encodeWord(5, 'gray', 4))).toBe(0b0111);
    expect(value(encodeWord(6, 'gray', 4))).toBe(0b0101);
    expect(value(encodeWord(15, 'gray', 4))).toBe(0b1000);
    expect(value(decodeWord(0b0111, 'gray', 4))).toBe(5);
    expect(value(decodeWord(0b1000, 'gray', 4))).toBe(15);
  });
  it('BCD: 1234 → 0x1234, 9999 is the 16-bit maximum', () => {
    expect(value(encodeWord(1234, 'bcd', 16))).toBe(0x1234);
    expect(value(decodeWord(0x1234, 'bcd', 16))).toBe(1234);
    expect(value(encodeWord(9999, 'bcd', 16))).toBe(0x9999);
    expect(value(encodeWord(10000, 'bcd', 16))).toBe('error');
    expect(value(decodeWord(0x12a4, 'bcd', 16))).toBe('error'); // nibble A is not a decimal digit
  });
  it('binary and width errors', () => {
    expect(value(encodeWord(255, 'binary', 8))).toBe(255);
    expect(value(encodeWord(256, 'binary', 8))).toBe('error');
    expect(value(encodeWord(-1, 'binary', 8))).toBe('error');
    expect(value(encodeWord(1.5, 'binary', 8))).toBe('error');
    expect(value(encodeWord(1, 'binary', 17))).toBe('error');
    expect(value(decodeWord(256, 'binary', 8))).toBe('error');
  });
  it('round-trips every 10-bit value in all encodings', () => {
    for (const enc of ['binary', 'gray'] as const) {
      for (let n = 0; n < 1024; n++) expect(value(decodeWord(value(encodeWord(n, enc, 10)) as number, enc, 10))).toBe(n);
    }
    for (let n = 0; n < 400; n++) expect(value(decodeWord(value(encodeWord(n, 'bcd', 10)) as number, 'bcd', 10))).toBe(n);
  });
});
