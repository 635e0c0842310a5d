/**
 * A small deterministic hash for traces: FNV-1a, 64-bit (Fowler–Noll–Vo; offset basis
 * 0xcbf29ce484222325, prime 0x100000001b3 = 2^40 + 435). Pure TypeScript, no platform
 * crypto, so the browser and Node give the same digest. Not a cryptographic hash: it
 * detects accidental differences between two runs, not tampering.
 */

/** FNV-1a 64 of the UTF-8 bytes of `text`, as 16 lowercase hex digits. */
export function fnv1a64(text: string): string {
  let hi = 0xcbf29ce4;
  let lo = 0x84222325;
  const mix = (byte: number) => {
    lo = (lo ^ byte) >>> 0;
    // (hi·2^32 + lo) · (2^40 + 435) mod 2^64, in 32-bit halves (every product stays below 2^53).
    const l435 = lo * 435;
    const carry = Math.floor(l435 / 4294967296);
    const newLo = l435 >>> 0;
    const newHi = (hi * 435 + carry + ((lo << 8) >>> 0)) % 4294967296;
    lo = newLo;
    hi = newHi >>> 0;
  };
  for (let i = 0; i < text.length; i++) {
    let c = text.charCodeAt(i);
    if (c >= 0xd800 && c <= 0xdbff && i + 1 < text.length) {
      const d = text.charCodeAt(i + 1);
      if (d >= 0xdc00 && d <= 0xdfff) {
        c = 0x10000 + ((c - 0xd800) << 10) + (d - 0xdc00);
        i++;
      }
    }
    if (c < 0x80) mix(c);
    else if (c < 0x800) {
      mix(0xc0 | (c >> 6));
      mix(0x80 | (c & 63));
    } else if (c < 0x10000) {
      mix(0xe0 | (c >> 12));
      mix(0x80 | ((c >> 6) & 63));
      mix(0x80 | (c & 63));
    } else {
      mix(0xf0 | (c >> 18));
      mix(0x80 | ((c >> 12) & 63));
      mix(0x80 | ((c >> 6) & 63));
      mix(0x80 | (c & 63));
    }
  }
  return hi.toString(16).padStart(8, '0') + lo.toString(16).padStart(8, '0');
}
