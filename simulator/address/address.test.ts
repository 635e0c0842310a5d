import { describe, expect, it } from 'vitest';
import { addressesOverlap, formatAddress, parseAddress } from './address';
import { createProcessImage, getWord, readAddress, setBit, toSigned, writeAddress } from './process-image';

// Syntax per IEC 61131-3 direct representation (%, location prefix I/Q/M, size prefix X/B/W/D,
// hierarchical address with '.'; an omitted size prefix means a single bit) — from memory.
describe('parseAddress', () => {
  it('parses bits, bytes, words and double words', () => {
    expect(parseAddress('%IX0.3')).toEqual({ ok: true, value: { area: 'I', size: 'X', byte: 0, bit: 3 } });
    expect(parseAddress('%QW2')).toEqual({ ok: true, value: { area: 'Q', size: 'W', byte: 2 } });
    expect(parseAddress('%MX5.0')).toEqual({ ok: true, value: { area: 'M', size: 'X', byte: 5, bit: 0 } });
    expect(parseAddress('%MD8')).toEqual({ ok: true, value: { area: 'M', size: 'D', byte: 8 } });
    expect(parseAddress('%IB7')).toEqual({ ok: true, value: { area: 'I', size: 'B', byte: 7 } });
  });
  it('reads an omitted size prefix with a bit as X, and accepts lower case', () => {
    expect(parseAddress('%I0.3')).toEqual({ ok: true, value: { area: 'I', size: 'X', byte: 0, bit: 3 } });
    expect(parseAddress(' %qx1.7 ')).toEqual({ ok: true, value: { area: 'Q', size: 'X', byte: 1, bit: 7 } });
  });
  it('rejects bad syntax and out-of-range parts with codes', () => {
    const codes = (t: string) => {
      const r = parseAddress(t);
      return r.ok ? [] : r.errors.map((e) => e.code);
    };
    expect(codes('IX0.0')).toEqual(['address_syntax']);
    expect(codes('%AX0.0')).toEqual(['address_syntax']);
    expect(codes('%IX0')).toEqual(['address_syntax']);
    expect(codes('%IW0.1')).toEqual(['address_syntax']);
    expect(codes('%IX0.8')).toEqual(['address_range']);
    expect(codes('%IX1024.0')).toEqual(['address_range']);
    expect(codes('%IW1023')).toEqual(['address_range']); // a word needs bytes 1023 and 1024
    expect(codes('%ID1021')).toEqual(['address_range']);
    expect(codes('%ID1020')).toEqual([]);
    expect(codes('%IX2000.9')).toEqual(['address_range', 'address_range']); // every problem, not the first
  });
  it('formats canonically and round-trips', () => {
    for (const t of ['%IX0.0', '%QX12.7', '%MW100', '%ID4', '%QB3']) {
      const r = parseAddress(t);
      expect(r.ok && formatAddress(r.value)).toBe(t);
    }
    const r = parseAddress('%I0.3');
    expect(r.ok && formatAddress(r.value)).toBe('%IX0.3');
  });
});

describe('overlap rule: byte-addressed, little-endian (documented in address.ts)', () => {
  it('%IW0 covers %IX0.0 (bit 0) .. %IX1.7 (bit 15)', () => {
    const img = createProcessImage();
    setBit(img, 'I', 0, 0, true);
    expect(getWord(img, 'I', 0)).toBe(1);
    setBit(img, 'I', 1, 7, true);
    expect(readAddress(img, '%IW0')).toBe(0x8001);
    const p = (t: string) => {
      const r = parseAddress(t);
      if (!r.ok) throw new Error(t);
      return r.value;
    };
    expect(addressesOverlap(p('%IW0'), p('%IX1.7'))).toBe(true);
    expect(addressesOverlap(p('%IW0'), p('%IX2.0'))).toBe(false);
    expect(addressesOverlap(p('%IW1'), p('%IW0'))).toBe(true);
    expect(addressesOverlap(p('%IW0'), p('%QW0'))).toBe(false);
  });
  it('words wrap to 16 bits and read back unsigned; toSigned gives INT', () => {
    const img = createProcessImage();
    writeAddress(img, '%QW4', -1);
    expect(readAddress(img, '%QW4')).toBe(65535);
    expect(toSigned(65535, 16)).toBe(-1);
    writeAddress(img, '%MD0', 0x12345678);
    expect(readAddress(img, '%MB0')).toBe(0x78); // little-endian: low byte first
    expect(readAddress(img, '%MD0')).toBe(0x12345678);
  });
});
