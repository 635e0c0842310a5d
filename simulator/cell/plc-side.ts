/**
 * The PLC in the cell: its process image, compiled sheet and state, and one scan — read
 * every input from the wiring, solve the sheet, write the outputs (forces applied on top).
 */
import { createProcessImage, setBit, setWord, writeAddress, type ProcessImage } from '@/simulator/address';
import { signalToCounts } from '@/simulator/electrical';
import type { CompiledSheet, PlcState } from '@/simulator/plc';
import type { CellDocument } from '@/simulator/schema/cell-document';
import type { Wiring } from './wiring';

export class PlcSide {
  readonly image: ProcessImage = createProcessImage();
  sheet: CompiledSheet;
  state: PlcState;
  scanMs: number;
  /** Bytes of the I area that wiring or forces can set (cleared before each scan). */
  readonly inputBytes: number;
  /** The I bytes the wiring delivered at the last full read (reused while that reading holds). */
  private inCache: Uint8Array;

  constructor(
    modules: CellDocument['plc']['modules'],
    sheet: CompiledSheet,
    private readonly forces: ReadonlyMap<string, number>,
  ) {
    this.sheet = sheet;
    this.state = sheet.createState();
    this.scanMs = sheet.scanPeriodMs;
    let bytes = 0;
    for (const m of modules) {
      if (m.kind === 'digital-out') continue;
      const last = m.kind === 'analog-in' ? m.address + m.channels * 2 : m.address + Math.ceil(m.channels / 8);
      bytes = Math.max(bytes, last);
    }
    this.inputBytes = bytes;
    this.inCache = new Uint8Array(bytes);
  }

  /** One scan: inputs from the wiring (or the held reading), forces on I, the sheet, forces on Q and M. */
  scan(wiring: Wiring): void {
    // Every input bit is rewritten from the wiring each scan; unwired bits read 0.
    const I = this.image.I;
    if (wiring.plcInValid) I.set(this.inCache);
    else this.readInputs(wiring, I);
    this.applyForces('I');
    this.sheet.scan(this.state, this.image, this.scanMs);
    this.applyForces('Q');
    this.applyForces('M');
    wiring.checkFedQ();
    wiring.updateLoads();
  }

  /** Writes the wiring's view of every PLC input into the first `inputBytes` of I, and keeps a copy. */
  private readInputs(wiring: Wiring, I: Uint8Array): void {
    I.fill(0, 0, this.inputBytes);
    const rows = wiring.plcInRows;
    const deadAny = wiring.host.faults.deadModules.size > 0;
    for (let k = 0; k < rows.length; k++) {
      const i = rows[k];
      const p = wiring.plans[i];
      const sink = p.sink;
      if (deadAny && wiring.sinkDead(sink)) continue;
      if (sink.kind === 'plc-bit') {
        if (wiring.readValue(i) !== 0) I[wiring.plcInByte[k]] |= wiring.plcInMask[k];
        continue;
      }
      const r = wiring.readRow(i, true);
      if (sink.kind === 'plc-word-bits') {
        for (let b = 0; b < p.bits; b++) {
          const ch = sink.module.address * 8 + sink.channel + b;
          setBit(this.image, 'I', ch >> 3, ch & 7, ((r.value >> b) & 1) === 1);
        }
      } else if (sink.kind === 'plc-analog') {
        // Saturating at the module's format limits; negative counts land as two's complement.
        const counts = signalToCounts(r.value, { range: sink.module.signal, bits: sink.module.resolutionBits, format: sink.module.format });
        setWord(this.image, 'I', sink.address.byte, counts & 0xffff);
      }
    }
    this.inCache.set(I.subarray(0, this.inputBytes));
    wiring.plcInValid = wiring.settled();
    wiring.noteFedQ();
  }

  /** Writes the forces on one area over the image. */
  applyForces(area: 'I' | 'Q' | 'M'): void {
    if (this.forces.size === 0) return;
    for (const [t, v] of this.forces) if (t.startsWith(`%${area}`)) writeAddress(this.image, t, v);
  }

  /**
   * A download of a new sheet: stop → run. The new sheet starts from a fresh state (first
   * scan, timers and counters at zero); outputs and memory are cleared at once, as a PLC in
   * stop drives its outputs off, then forces on them are written again. The new sheet's first
   * scan, at the next multiple of its own period, writes the outputs.
   */
  load(sheet: CompiledSheet): void {
    this.sheet = sheet;
    this.state = sheet.createState();
    this.scanMs = sheet.scanPeriodMs;
    this.image.Q.fill(0);
    this.image.M.fill(0);
    this.applyForces('Q');
    this.applyForces('M');
  }
}
