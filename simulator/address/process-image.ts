/**
 * The PLC process image: I, Q and M memory as bytes, with typed access by address.
 *
 * Layout and overlap follow the rule documented in ./address.ts: byte-addressed,
 * little-endian words and double words. Words and double words are unsigned
 * (WORD 0..65535, DWORD 0..4294967295); a write keeps the low bits of the value's
 * integer part, so -1 written to a word reads back as 65535. Use {@link toSigned}
 * to read an INT/DINT.
 *
 * The object is mutable and owned by its caller; {@link cloneProcessImage} copies it.
 */
import { AREA_BYTES, parseAddressCached, type Address, type Area } from './address';

/** The three memory areas as plain byte arrays (plain data: structuredClone works on it). */
export type ProcessImage = {
  I: Uint8Array;
  Q: Uint8Array;
  M: Uint8Array;
};

/** Creates a zeroed process image with {@link AREA_BYTES} bytes per area. */
export function createProcessImage(bytesPerArea: number = AREA_BYTES): ProcessImage {
  return { I: new Uint8Array(bytesPerArea), Q: new Uint8Array(bytesPerArea), M: new Uint8Array(bytesPerArea) };
}

/** Deep copy of a process image. */
export function cloneProcessImage(img: ProcessImage): ProcessImage {
  return { I: img.I.slice(), Q: img.Q.slice(), M: img.M.slice() };
}

/** Reads one bit (`true` when set). */
export function getBit(img: ProcessImage, area: Area, byte: number, bit: number): boolean {
  return ((img[area][byte] >> bit) & 1) === 1;
}

/** Writes one bit. */
export function setBit(img: ProcessImage, area: Area, byte: number, bit: number, on: boolean): void {
  const mem = img[area];
  mem[byte] = on ? mem[byte] | (1 << bit) : mem[byte] & ~(1 << bit);
}

/** Writes a byte (low 8 bits of the integer part). */
export function setByte(img: ProcessImage, area: Area, byte: number, value: number): void {
  img[area][byte] = toInt(value) & 0xff;
}

/** Reads an unsigned little-endian 16-bit word starting at `byte`. */
export function getWord(img: ProcessImage, area: Area, byte: number): number {
  const mem = img[area];
  return mem[byte] | (mem[byte + 1] << 8);
}

/** Writes a little-endian 16-bit word (low 16 bits of the integer part). */
export function setWord(img: ProcessImage, area: Area, byte: number, value: number): void {
  const mem = img[area];
  const v = toInt(value);
  mem[byte] = v & 0xff;
  mem[byte + 1] = (v >>> 8) & 0xff;
}

/** Reads an unsigned little-endian 32-bit double word starting at `byte`. */
export function getDWord(img: ProcessImage, area: Area, byte: number): number {
  const mem = img[area];
  return (mem[byte] | (mem[byte + 1] << 8) | (mem[byte + 2] << 16) | (mem[byte + 3] << 24)) >>> 0;
}

/** Writes a little-endian 32-bit double word (low 32 bits of the integer part). */
export function setDWord(img: ProcessImage, area: Area, byte: number, value: number): void {
  const mem = img[area];
  const v = toInt(value);
  mem[byte] = v & 0xff;
  mem[byte + 1] = (v >>> 8) & 0xff;
  mem[byte + 2] = (v >>> 16) & 0xff;
  mem[byte + 3] = (v >>> 24) & 0xff;
}

/**
 * Reads any address: a bit as 0/1, a byte/word/double word as its unsigned value.
 * Accepts a parsed {@link Address} or its text (parsed once and cached); an invalid
 * text throws, because it is a programming error here — validate documents first.
 */
export function readAddress(img: ProcessImage, address: Address | string): number {
  const a = resolve(address);
  switch (a.size) {
    case 'X':
      return (img[a.area][a.byte] >> (a.bit ?? 0)) & 1;
    case 'B':
      return img[a.area][a.byte];
    case 'W':
      return getWord(img, a.area, a.byte);
    case 'D':
      return getDWord(img, a.area, a.byte);
  }
}

/** Writes any address: a bit takes `value !== 0` (or a boolean), wider sizes the low bits. */
export function writeAddress(img: ProcessImage, address: Address | string, value: number | boolean): void {
  const a = resolve(address);
  const n = typeof value === 'boolean' ? (value ? 1 : 0) : value;
  switch (a.size) {
    case 'X':
      setBit(img, a.area, a.byte, a.bit ?? 0, n !== 0 && !Number.isNaN(n));
      return;
    case 'B':
      setByte(img, a.area, a.byte, n);
      return;
    case 'W':
      setWord(img, a.area, a.byte, n);
      return;
    case 'D':
      setDWord(img, a.area, a.byte, n);
      return;
  }
}

/** Reinterprets an unsigned value of `bits` bits as two's complement (WORD → INT, DWORD → DINT). */
export function toSigned(value: number, bits: 8 | 16 | 32): number {
  const half = 2 ** (bits - 1);
  return value >= half ? value - 2 ** bits : value;
}

function resolve(address: Address | string): Address {
  if (typeof address !== 'string') return address;
  const a = parseAddressCached(address);
  if (!a) throw new Error(`invalid direct address "${address}"`);
  return a;
}

/** Integer part, NaN and infinities as 0, so typed-array writes are deterministic. */
function toInt(value: number): number {
  return Number.isFinite(value) ? Math.trunc(value) : 0;
}
