/**
 * Reference interpreter: walks the sheet graph on every scan, written for obviousness
 * rather than speed, and shares no code with the compiler beyond validation. Tests run
 * both on the same sheets and inputs and require identical results. Not for production use.
 */
import { readAddress, writeAddress, type ProcessImage } from '@/simulator/address/process-image';
import type { Problem, Result } from '@/simulator/shared/result';
import type { BlockOutputs, InterpretedSheet } from './api';
import { blockCatalogue, blockPorts } from './catalogue';
import type { LogicSheet, SheetBlock } from './sheet-schema';
import { analyseSheet, type AnalyseOptions } from './validate';

type Value = boolean | number;

/** Builds a reference interpreter for a sheet (validated first; same problems as compileSheet). */
export function interpretSheet(document: unknown, options: AnalyseOptions = {}): Result<InterpretedSheet, Problem> {
  const v = analyseSheet(document, options);
  if (!v.ok) return v;
  const sheet: LogicSheet = v.value.sheet;
  // Only the SPAN_MAP raw spans are taken from the analysis (where a span comes from is validation).
  const spanOf = new Map(sheet.blocks.map((b, k) => [b, v.value.spans[k]]));
  const blocks = sheet.blocks;

  // The source of an input: search the connection list every time (slow on purpose).
  const sourceOf = (blockId: string, port: string) =>
    sheet.connections.find((c) => c.to.block === blockId && c.to.port === port)?.from;

  // Execution order by repeated selection: the earliest block in the sheet whose
  // (non-PREV) inputs all come from blocks already placed.
  const order: SheetBlock[] = [];
  const placed = new Set<string>();
  while (order.length < blocks.length) {
    const next = blocks.find(
      (b) =>
        !placed.has(b.id) &&
        (blockCatalogue[b.type].breaksLoops ||
          sheet.connections.every((c) => c.to.block !== b.id || placed.has(c.from.block))),
    );
    if (!next) throw new Error('validated sheet has a loop');
    order.push(next);
    placed.add(next.id);
  }

  const outputs = new Map<string, Map<string, Value>>();
  const memory = new Map<string, Record<string, Value>>();
  for (const b of blocks) {
    const outs = new Map<string, Value>();
    for (const p of blockPorts(b.type, b.params as Record<string, unknown>).outputs) outs.set(p.name, p.default);
    outputs.set(b.id, outs);
    memory.set(b.id, {});
    if (b.type === 'PREV_BOOL') outs.set('Q', b.params.initial);
    if (b.type === 'PREV_NUM') outs.set('OUT', b.params.initial);
    if (b.type === 'PREV_BOOL' || b.type === 'PREV_NUM') memory.get(b.id)!.prev = b.params.initial;
  }

  const input = (b: SheetBlock, port: string): Value => {
    const src = sourceOf(b.id, port);
    if (src) return outputs.get(src.block)!.get(src.port)!;
    const spec = blockPorts(b.type, b.params as Record<string, unknown>).inputs.find((p) => p.name === port)!;
    return spec.fromParam ? ((b.params as Record<string, number>)[spec.fromParam]) : spec.default;
  };
  const bool = (b: SheetBlock, port: string): boolean => Boolean(input(b, port));
  const num = (b: SheetBlock, port: string): number => Number(input(b, port));

  function evaluate(b: SheetBlock, image: ProcessImage, dt: number): void {
    const out = outputs.get(b.id)!;
    const mem = memory.get(b.id)!;
    const prevQ = (name: string) => out.get(name) as Value;
    switch (b.type) {
      case 'NO_CONTACT':
        out.set('Q', bool(b, 'IN') && readAddress(image, b.params.address) === 1);
        return;
      case 'NC_CONTACT':
        out.set('Q', bool(b, 'IN') && readAddress(image, b.params.address) === 0);
        return;
      case 'COIL': {
        const x = bool(b, 'IN');
        out.set('Q', x);
        writeAddress(image, b.params.address, x);
        return;
      }
      case 'SET_COIL': {
        const x = bool(b, 'IN');
        out.set('Q', x);
        if (x) writeAddress(image, b.params.address, true);
        return;
      }
      case 'RESET_COIL': {
        const x = bool(b, 'IN');
        out.set('Q', x);
        if (x) writeAddress(image, b.params.address, false);
        return;
      }
      case 'AND':
      case 'OR':
      case 'XOR': {
        const xs = blockPorts(b.type, b.params).inputs.map((p) => bool(b, p.name));
        if (b.type === 'AND') out.set('Q', xs.every(Boolean));
        else if (b.type === 'OR') out.set('Q', xs.some(Boolean));
        else out.set('Q', xs.filter(Boolean).length % 2 === 1);
        return;
      }
      case 'NOT':
        out.set('Q', !bool(b, 'IN'));
        return;
      case 'TON': {
        const x = bool(b, 'IN');
        const pt = Math.max(0, num(b, 'PT') || 0);
        let et = 0;
        if (x && mem.wasOn === true) et = Math.min(pt, (prevQ('ET') as number) + dt);
        out.set('ET', et);
        out.set('Q', x && et >= pt);
        mem.wasOn = x;
        return;
      }
      case 'TOF': {
        const x = bool(b, 'IN');
        const pt = Math.max(0, num(b, 'PT') || 0);
        const wasOn = mem.wasOn === true;
        let et = prevQ('ET') as number;
        let q = prevQ('Q') as boolean;
        if (x) {
          et = 0;
          q = true;
        } else if (wasOn) {
          et = 0;
          q = pt > 0;
        } else if (q) {
          et = Math.min(pt, et + dt);
          q = et < pt;
        } else q = false;
        out.set('ET', et);
        out.set('Q', q);
        mem.wasOn = x;
        return;
      }
      case 'TP': {
        const x = bool(b, 'IN');
        const pt = Math.max(0, num(b, 'PT') || 0);
        let et = prevQ('ET') as number;
        let q = prevQ('Q') as boolean;
        if (q) {
          et = Math.min(pt, et + dt);
          if (et >= pt) q = false;
        } else if (x && mem.wasOn !== true) {
          et = 0;
          q = pt > 0;
        }
        if (!q && !x) et = 0;
        out.set('ET', et);
        out.set('Q', q);
        mem.wasOn = x;
        return;
      }
      case 'CTU': {
        const cu = bool(b, 'CU');
        const edge = cu && mem.cu !== true;
        mem.cu = cu;
        let cv = prevQ('CV') as number;
        if (bool(b, 'R')) cv = 0;
        else if (edge && cv < 32767) cv += 1;
        out.set('CV', cv);
        out.set('Q', cv >= num(b, 'PV'));
        return;
      }
      case 'CTD': {
        const cd = bool(b, 'CD');
        const edge = cd && mem.cd !== true;
        mem.cd = cd;
        let cv = prevQ('CV') as number;
        if (bool(b, 'LD')) cv = num(b, 'PV');
        else if (edge && cv > -32768) cv -= 1;
        out.set('CV', cv);
        out.set('Q', cv <= 0);
        return;
      }
      case 'CTUD': {
        const cu = bool(b, 'CU');
        const cd = bool(b, 'CD');
        const up = cu && mem.cu !== true;
        const down = cd && mem.cd !== true;
        mem.cu = cu;
        mem.cd = cd;
        const pv = num(b, 'PV');
        let cv = prevQ('CV') as number;
        if (bool(b, 'R')) cv = 0;
        else if (bool(b, 'LD')) cv = pv;
        else if (up && !down && cv < 32767) cv += 1;
        else if (down && !up && cv > -32768) cv -= 1;
        out.set('CV', cv);
        out.set('QU', cv >= pv);
        out.set('QD', cv <= 0);
        return;
      }
      case 'SR':
        out.set('Q1', bool(b, 'S1') || (!bool(b, 'R') && (prevQ('Q1') as boolean)));
        return;
      case 'RS':
        out.set('Q1', !bool(b, 'R1') && (bool(b, 'S') || (prevQ('Q1') as boolean)));
        return;
      case 'R_TRIG': {
        const clk = bool(b, 'CLK');
        out.set('Q', clk && mem.m !== true);
        mem.m = clk;
        return;
      }
      case 'F_TRIG': {
        const clk = bool(b, 'CLK');
        out.set('Q', !clk && mem.m !== true);
        mem.m = !clk;
        return;
      }
      case 'GT':
        out.set('Q', num(b, 'IN1') > num(b, 'IN2'));
        return;
      case 'GE':
        out.set('Q', num(b, 'IN1') >= num(b, 'IN2'));
        return;
      case 'EQ':
        out.set('Q', num(b, 'IN1') === num(b, 'IN2'));
        return;
      case 'NE':
        out.set('Q', num(b, 'IN1') !== num(b, 'IN2'));
        return;
      case 'LE':
        out.set('Q', num(b, 'IN1') <= num(b, 'IN2'));
        return;
      case 'LT':
        out.set('Q', num(b, 'IN1') < num(b, 'IN2'));
        return;
      case 'MOVE':
        out.set('OUT', num(b, 'IN'));
        return;
      case 'SEL':
        out.set('OUT', bool(b, 'G') ? num(b, 'IN1') : num(b, 'IN0'));
        return;
      case 'LIMIT':
        out.set('OUT', Math.min(Math.max(num(b, 'IN'), num(b, 'MN')), num(b, 'MX')));
        return;
      case 'SPAN_MAP': {
        const { outMin, outMax, clamp } = b.params;
        const { inMin, inMax } = spanOf.get(b) as { inMin: number; inMax: number };
        const y = outMin + (num(b, 'IN') - inMin) * (outMax - outMin) / (inMax - inMin);
        out.set('OUT', clamp ? Math.min(Math.max(y, Math.min(outMin, outMax)), Math.max(outMin, outMax)) : y);
        return;
      }
      case 'WORD_IN': {
        const raw = readAddress(image, b.params.address);
        const size = b.params.address.trim().toUpperCase()[2];
        const bits = size === 'B' ? 8 : size === 'W' ? 16 : 32;
        out.set('OUT', b.params.signed && raw >= 2 ** (bits - 1) ? raw - 2 ** bits : raw);
        return;
      }
      case 'WORD_OUT': {
        const x = num(b, 'IN');
        writeAddress(image, b.params.address, Number.isFinite(x) ? Math.round(x) : 0);
        return;
      }
      case 'CONST':
        out.set('OUT', b.params.value);
        return;
      case 'CONST_BOOL':
        out.set('Q', b.params.value);
        return;
      case 'PREV_BOOL':
        out.set('Q', mem.prev as boolean);
        return;
      case 'PREV_NUM':
        out.set('OUT', mem.prev as number);
        return;
    }
  }

  const interpreted: InterpretedSheet = {
    order: order.map((b) => b.id),
    scan(image: ProcessImage, dtMs: number = sheet.scanPeriodMs) {
      const dt = Number.isFinite(dtMs) && dtMs > 0 ? dtMs : 0;
      for (const b of order) evaluate(b, image, dt);
      // Previous-scan blocks latch their input only once the whole sheet has been solved.
      for (const b of blocks) {
        if (b.type === 'PREV_BOOL') memory.get(b.id)!.prev = bool(b, 'IN');
        if (b.type === 'PREV_NUM') memory.get(b.id)!.prev = num(b, 'IN');
      }
    },
    readBlockOutputs(): BlockOutputs {
      const result: BlockOutputs = {};
      for (const b of order) {
        const outs = outputs.get(b.id)!;
        if (outs.size === 0) continue;
        result[b.id] = Object.fromEntries([...outs].map(([k, x]) => [k, typeof x === 'boolean' ? x : Number(x)]));
      }
      return result;
    },
  };
  return { ok: true, value: interpreted };
}
