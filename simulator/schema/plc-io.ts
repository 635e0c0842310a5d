/**
 * Which PLC module a direct address lands on. Used by validation and by the cell to route
 * wiring rows; pure lookups over the document's module list.
 */
import type { Address } from '@/simulator/address/address';
import type { PlcModule } from './cell-document';

/** The module and channel(s) an address reaches, or null when no module covers it. */
export type PlcIoHit = { module: PlcModule; channel: number; width: number };

/**
 * Finds the module that covers an address. Bits (`X`) hit one channel of a digital module;
 * words/bytes hit 16/8 consecutive channels of a digital module, or one channel of an
 * analog input module (words only). Memory (`%M`) is on no module.
 */
export function plcModuleFor(modules: readonly PlcModule[], a: Address): PlcIoHit | null {
  if (a.area === 'M') return null;
  for (const m of modules) {
    const isInput = m.kind === 'digital-in' || m.kind === 'analog-in';
    if ((a.area === 'I') !== isInput) continue;
    if (m.kind === 'analog-in') {
      if (a.size !== 'W') continue;
      const off = a.byte - m.address;
      if (off >= 0 && off % 2 === 0 && off / 2 < m.channels) return { module: m, channel: off / 2, width: 1 };
      continue;
    }
    const first = (a.byte - m.address) * 8 + (a.size === 'X' ? (a.bit ?? 0) : 0);
    const width = a.size === 'X' ? 1 : a.size === 'B' ? 8 : a.size === 'W' ? 16 : 32;
    if (first >= 0 && first + width <= m.channels) return { module: m, channel: first, width };
    // A word may be wired with fewer bits than it has (a 4-bit recipe number on %QW1):
    // accept when at least its first bit is on the module; the row's `bits` are checked later.
    if (first >= 0 && first < m.channels && width > 1) return { module: m, channel: first, width: m.channels - first };
  }
  return null;
}

/** Byte span a PLC module occupies in its area: [first, last]. */
export function plcModuleBytes(m: PlcModule): [number, number] {
  if (m.kind === 'analog-in') return [m.address, m.address + m.channels * 2 - 1];
  return [m.address, m.address + Math.ceil(m.channels / 8) - 1];
}
