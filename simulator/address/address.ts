/**
 * IEC 61131-3 direct representation of PLC memory (%I inputs, %Q outputs, %M memory).
 *
 * Written form: `%` + area (`I`, `Q`, `M`) + size (`X` bit, `B` byte, `W` word = 16 bits,
 * `D` double word = 32 bits) + byte number, and for bits `.bit`. IEC 61131-3 lets the size
 * prefix be omitted for a single bit, so `%I0.3` is read as `%IX0.3`; the canonical form
 * written by {@link formatAddress} always carries the size letter.
 *
 * Overlap rule (one rule for the whole engine): every area is byte-addressed memory, and
 * a wider access covers consecutive bytes starting at its byte number, little-endian.
 * So `%IW0` is bytes 0 and 1, with `%IX0.0` its least significant bit (bit 0) and
 * `%IX1.7` its most significant bit (bit 15); `%ID4` is bytes 4..7. `%IW1` is legal
 * and overlaps both `%IW0` and `%IW2` (no alignment is required). Little-endian was chosen
 * so that bit k of a word is point k of a group of 16 discrete points, which is how word
 * points (grouped bits, DESIGN.md) read naturally.
 *
 * Limits: byte numbers 0..1023 per area ({@link MAX_BYTE}); bit numbers 0..7; a word or
 * double word must end inside the area (so `%IW1023` and `%ID1021` are out of range).
 */
import type { Problem, Result } from '@/simulator/shared/result';

/** Memory area: process inputs, process outputs, internal memory. */
export type Area = 'I' | 'Q' | 'M';
/** Access size: bit, byte, 16-bit word, 32-bit double word. */
export type Size = 'X' | 'B' | 'W' | 'D';

/** A parsed direct address. `bit` is present exactly when `size === 'X'`. */
export type Address = {
  area: Area;
  size: Size;
  byte: number;
  bit?: number;
};

/** Bytes in each of the I, Q and M areas. */
export const AREA_BYTES = 1024;
/** Highest byte number of an area. */
export const MAX_BYTE = AREA_BYTES - 1;
/** Highest bit number inside a byte. */
export const MAX_BIT = 7;
/** Width in bytes of each access size (a bit access touches one byte). */
export const SIZE_BYTES: Record<Size, number> = { X: 1, B: 1, W: 2, D: 4 };
/** Width in bits of each access size. */
export const SIZE_BITS: Record<Size, number> = { X: 1, B: 8, W: 16, D: 32 };

const PATTERN = /^%([IQM])([XBWD])?(\d{1,6})(?:\.(\d{1,3}))?$/;

/**
 * Parses a direct address such as `%IX0.3`, `%QW2`, `%MD8` or `%I0.3`.
 * Whitespace around the text is ignored; letters may be lower or upper case.
 * Returns every problem found (syntax, byte range, bit range, bit/size mismatch).
 */
export function parseAddress(text: string): Result<Address, Problem> {
  const raw = typeof text === 'string' ? text.trim().toUpperCase() : '';
  const m = PATTERN.exec(raw);
  if (!m) {
    return {
      ok: false,
      errors: [
        {
          path: [],
          code: 'address_syntax',
          message: `"${String(text)}" is not a direct address like %IX0.0, %QW2 or %MD4`,
        },
      ],
    };
  }
  const area = m[1] as Area;
  const hasBit = m[4] !== undefined;
  const size = (m[2] as Size | undefined) ?? (hasBit ? 'X' : undefined);
  const errors: Problem[] = [];
  if (size === undefined) {
    errors.push({ path: [], code: 'address_syntax', message: `"${text}" needs a size letter (X, B, W, D) or a .bit` });
    return { ok: false, errors };
  }
  const byte = Number(m[3]);
  const bit = hasBit ? Number(m[4]) : undefined;
  if (size === 'X' && !hasBit) {
    errors.push({ path: [], code: 'address_syntax', message: `bit address "${text}" needs a .bit number (e.g. %${area}X${byte}.0)` });
  }
  if (size !== 'X' && hasBit) {
    errors.push({ path: [], code: 'address_syntax', message: `"${text}": only X (bit) addresses take a .bit number` });
  }
  const width = SIZE_BYTES[size];
  if (byte + width - 1 > MAX_BYTE) {
    errors.push({
      path: [],
      code: 'address_range',
      message: `"${text}": byte ${byte}${width > 1 ? `..${byte + width - 1}` : ''} is outside 0..${MAX_BYTE}`,
    });
  }
  if (bit !== undefined && bit > MAX_BIT) {
    errors.push({ path: [], code: 'address_range', message: `"${text}": bit ${bit} is outside 0..${MAX_BIT}` });
  }
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: size === 'X' ? { area, size, byte, bit } : { area, size, byte } };
}

/** Writes an address in canonical form, e.g. `%IX0.3`, `%QW2`. */
export function formatAddress(a: Address): string {
  return a.size === 'X' ? `%${a.area}X${a.byte}.${a.bit ?? 0}` : `%${a.area}${a.size}${a.byte}`;
}

const cache = new Map<string, Address | null>();

/**
 * Parses with a cache, for hot paths that look addresses up by text.
 * Returns `null` for an invalid address (use {@link parseAddress} for the reasons).
 */
export function parseAddressCached(text: string): Address | null {
  let hit = cache.get(text);
  if (hit === undefined) {
    const r = parseAddress(text);
    hit = r.ok ? r.value : null;
    // The cache is bounded so a stream of distinct strings cannot grow memory without limit.
    if (cache.size > 10_000) cache.clear();
    cache.set(text, hit);
  }
  return hit;
}

/** Inclusive bit range `[first, last]` an address covers, counted as byte*8+bit inside its area. */
export function addressBitSpan(a: Address): [number, number] {
  const first = a.byte * 8 + (a.size === 'X' ? (a.bit ?? 0) : 0);
  return [first, first + SIZE_BITS[a.size] - 1];
}

/** True when two addresses share at least one bit of memory (same area, overlapping bytes/bits). */
export function addressesOverlap(a: Address, b: Address): boolean {
  if (a.area !== b.area) return false;
  const [a0, a1] = addressBitSpan(a);
  const [b0, b1] = addressBitSpan(b);
  return a0 <= b1 && b0 <= a1;
}
