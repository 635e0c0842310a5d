/**
 * The PLC link's register map: which Modbus table and offset carries each of a cell's PLC
 * addresses. Pure (shared by the server, the worker thread and the session page).
 *
 * Tables (MODBUS Application Protocol Specification V1.1b3, §4.3 "Data Model"):
 * - coils (read/write bits, function codes 1, 5, 15) ← `%QX`: the PLC writes the cell's outputs;
 * - discrete inputs (read-only bits, function code 2) ← `%IX`: the PLC reads the cell's inputs;
 * - holding registers (read/write words, function codes 3, 6, 16) ← `%QW`;
 * - input registers (read-only words, function code 4) ← `%IW`.
 *
 * Which addresses: every channel of the cell's PLC modules (digital-in → `%IX`, digital-out →
 * `%QX`, analog-in channel k → `%IW<address + 2k>`), every I/Q address named by a wiring row,
 * and every I/Q address the cell's own logic sheet names (what the connected PLC replaces).
 * Order: within each table by byte, then bit, ascending; offsets count from 0 with no gaps, so
 * the map is the same for the same document. Words overlap bits in the process image (bytes
 * n and n+1, docs/engine.md): a bit that lies inside a word already in the map is left out of
 * the bit table, so the PLC writes each piece of memory through exactly one table.
 */
import { parseAddress, formatAddress } from '@/simulator';
import type { CellDocument } from '@/simulator';
import { csvSafeCell } from '@/lib/csv-cell';

export type ModbusTable = 'coil' | 'discrete-input' | 'holding-register' | 'input-register';
export type MapDirection = 'plc-writes' | 'plc-reads';

export interface RegisterMapRow {
  table: ModbusTable;
  /** 0-based offset in its table (the PDU address; "register 1" in 1-based tools is offset 0). */
  offset: number;
  /** Canonical IEC 61131-3 direct address (`%QX0.0`, `%IW4`). */
  address: string;
  /** What the address is wired to in the cell, or the sheet blocks that named it. */
  label: string;
  direction: MapDirection;
}

export const TABLE_ORDER: readonly ModbusTable[] = ['coil', 'discrete-input', 'holding-register', 'input-register'];

const TABLE_OF: Record<string, ModbusTable> = { QX: 'coil', IX: 'discrete-input', QW: 'holding-register', IW: 'input-register' };

/** The register map of a cell document, in table order, then offset order. */
export function registerMap(doc: CellDocument): RegisterMapRow[] {
  const labels = new Map<string, string[]>();
  const seen = new Set<string>();
  const note = (text: string, label?: string) => {
    const p = parseAddress(text);
    if (!p.ok) return;
    const a = p.value;
    if (a.area === 'M' || (a.size !== 'X' && a.size !== 'W')) return;
    const canon = formatAddress(a);
    seen.add(canon);
    if (label) {
      const list = labels.get(canon) ?? [];
      if (!list.includes(label)) list.push(label);
      labels.set(canon, list);
    }
  };

  for (const m of doc.plc.modules) {
    if (m.kind === 'digital-in' || m.kind === 'digital-out') {
      const area = m.kind === 'digital-in' ? 'I' : 'Q';
      for (let k = 0; k < m.channels; k++) note(`%${area}X${m.address + Math.floor(k / 8)}.${k % 8}`);
    } else if (m.kind === 'analog-in') {
      for (let k = 0; k < m.channels; k++) note(`%IW${m.address + 2 * k}`, `${m.id} channel ${k}`);
    }
  }
  const deviceLabel = new Map<string, string>();
  for (const d of [...doc.panel, ...doc.field]) deviceLabel.set(d.id, d.label);
  for (const row of doc.wiring) {
    const ends = [row.from, row.to];
    for (let i = 0; i < 2; i++) {
      const here = ends[i] as Record<string, unknown>;
      const there = ends[1 - i] as Record<string, unknown>;
      if (typeof here.plc !== 'string') continue;
      let label = row.id;
      if (typeof there.device === 'string') label = `${deviceLabel.get(there.device) ?? there.device} (${String(there.terminal)})`;
      else if (there.controller && typeof there.controller === 'object') {
        const c = there.controller as { rack: number; slot: number; channel: number };
        label = `controller rack ${c.rack} slot ${c.slot} channel ${c.channel}`;
      }
      note(here.plc, label);
    }
  }
  for (const b of doc.plc.sheet.blocks) {
    const address = (b.params as Record<string, unknown> | undefined)?.address;
    if (typeof address === 'string') note(address, `sheet ${b.id}`);
  }

  const parsed = [...seen].map((text) => ({ text, a: parseAddress(text) })).flatMap((x) => (x.a.ok ? [{ text: x.text, a: x.a.value }] : []));
  // Bytes covered by a word: the bits inside are carried by the register instead.
  const wordBytes = new Set<string>();
  for (const { a } of parsed) if (a.size === 'W') { wordBytes.add(`${a.area}${a.byte}`); wordBytes.add(`${a.area}${a.byte + 1}`); }
  const kept = parsed.filter(({ a }) => a.size === 'W' || !wordBytes.has(`${a.area}${a.byte}`));
  kept.sort((x, y) => TABLE_ORDER.indexOf(TABLE_OF[x.a.area + x.a.size]) - TABLE_ORDER.indexOf(TABLE_OF[y.a.area + y.a.size]) || x.a.byte - y.a.byte || (x.a.bit ?? 0) - (y.a.bit ?? 0));
  const next: Record<ModbusTable, number> = { coil: 0, 'discrete-input': 0, 'holding-register': 0, 'input-register': 0 };
  return kept.map(({ text, a }) => {
    const table = TABLE_OF[a.area + a.size];
    return { table, offset: next[table]++, address: text, label: (labels.get(text) ?? []).join('; '), direction: a.area === 'Q' ? 'plc-writes' : 'plc-reads' };
  });
}

export const REGISTER_MAP_COLUMNS = ['table', 'offset', 'address', 'label', 'direction'] as const;

function csvField(value: string): string {
  const safe = csvSafeCell(value);
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** The map as CSV (RFC 4180, CRLF line ends), every cell neutralised against formula injection. */
export function registerMapCsv(rows: readonly RegisterMapRow[]): string {
  const lines = [REGISTER_MAP_COLUMNS.join(',')];
  for (const r of rows) lines.push([r.table, String(r.offset), r.address, r.label, r.direction].map(csvField).join(','));
  return lines.join('\r\n') + '\r\n';
}

/** Per table: the addresses by offset (what the Modbus server indexes). */
export function tablesOf(rows: readonly RegisterMapRow[]): Record<ModbusTable, string[]> {
  const t: Record<ModbusTable, string[]> = { coil: [], 'discrete-input': [], 'holding-register': [], 'input-register': [] };
  for (const r of rows) t[r.table][r.offset] = r.address;
  return t;
}
