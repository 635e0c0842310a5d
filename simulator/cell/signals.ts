/**
 * Named signals of a running cell, as traces, rules and fault triggers read them:
 * `time`; `plc.<address>`; `plc.<block>.<port>`; `plc.fault.<module>`; `ctl.state`,
 * `ctl.servo`, `ctl.pc`, `ctl.alarms`, `ctl.cycles`, `ctl.<point>`; `arm.<axis>`,
 * `arm.speed`, `arm.moving`; `dev.<id>.<property>`; `wire.<row>` (level) and `in.<row>`
 * (reading 0/1); `link.healthy`; `fault.<card>` (1 when active); `hs.<role>` handshake
 * outputs. Booleans read as 0/1. The list itself is signal-names.ts.
 */
import { parseAddress, readAddress } from '@/simulator/address';
import { parsePointRef } from '@/simulator/controller/point-map';
import { HANDSHAKE_OUTPUT_ROLES } from '@/simulator/schema/cell-document';
import type { SignalValue } from '@/simulator/trace/predicate';
import { deviceSnapshot } from './devices';
import type { CellParts } from './parts';

type Reader = () => SignalValue;

const zero: Reader = () => 0;
const b = (x: boolean) => (x ? 1 : 0);

/** Resolves signal names to readers, once per name (and again after a download). */
export class Signals {
  private readonly readers = new Map<string, Reader>();
  /** Counts downloads; readers re-resolve their signal when it changes (see {@link reader}). */
  private generation = 0;

  constructor(private readonly parts: CellParts) {}

  /** A download replaced parts of the document: every reader resolves its name again. */
  renew(): void {
    this.generation++;
    this.readers.clear();
  }

  /** A reader of the signal `name`, or null when the cell has no such signal. */
  reader(name: string): Reader | null {
    const hit = this.readers.get(name);
    if (hit) return hit;
    const first = this.resolve(name);
    if (!first) return null;
    let inner: Reader = first;
    // A download can replace the sheet, the wiring or the routine, so a reader re-resolves its
    // name once per download: the trace recorder and fault triggers hold readers for the whole
    // run. A name the new parts no longer have reads 0 (a trace's signal list never changes).
    let gen = this.generation;
    const r = () => {
      if (gen !== this.generation) {
        gen = this.generation;
        inner = this.resolve(name) ?? zero;
      }
      return inner();
    };
    this.readers.set(name, r);
    return r;
  }

  /** The value of `name` now (0 for an unknown name). */
  read(name: string): SignalValue {
    const r = this.reader(name);
    return r ? r() : 0;
  }

  private resolve(name: string): Reader | null {
    const { clock, plc, controller: ctl, wiring, board, faults, devices } = this.parts;
    if (name === 'time') return () => clock.now;
    const dot = name.indexOf('.');
    if (dot < 0) return null;
    const head = name.slice(0, dot);
    const rest = name.slice(dot + 1);
    switch (head) {
      case 'plc': {
        if (rest.startsWith('%')) {
          const a = parseAddress(rest);
          if (!a.ok) return null;
          const addr = a.value;
          return () => readAddress(plc.image, addr);
        }
        if (rest.startsWith('fault.')) {
          const id = rest.slice(6);
          if (!this.parts.doc.plc.modules.some((m) => m.id === id)) return null;
          return () => b(faults.moduleDead(id));
        }
        const d2 = rest.lastIndexOf('.');
        if (d2 < 0) return null;
        const block = rest.slice(0, d2);
        const port = rest.slice(d2 + 1);
        if (plc.sheet.readOutput(plc.state, block, port) === undefined) return null;
        return () => {
          const v = plc.sheet.readOutput(plc.state, block, port);
          return typeof v === 'boolean' ? b(v) : (v ?? 0);
        };
      }
      case 'ctl': {
        switch (rest) {
          case 'state':
            return () => ctl.stateName().state;
          case 'servo':
            return () => b(ctl.ctx().servoOn);
          case 'pc':
            return () => ctl.ctx().pc;
          case 'alarms':
            return () => ctl.ctx().alarms.length;
          case 'cycles':
            return () => ctl.ctx().cyclesCompleted;
        }
        const p = parsePointRef(rest);
        if (!p) return null;
        return p.input ? () => ctl.logicalIn[rest] ?? 0 : () => ctl.logicalOut[rest] ?? 0;
      }
      case 'hs':
        if (!(HANDSHAKE_OUTPUT_ROLES as readonly string[]).includes(rest)) return null;
        return () => b(ctl.handshakeOutputs()[rest]);
      case 'arm': {
        if (rest === 'speed') return () => ctl.armNow().speed;
        if (rest === 'moving') return () => b(ctl.armNow().moving);
        const axis = Number(rest);
        if (!Number.isInteger(axis) || axis < 0 || axis >= this.parts.doc.controller.axes) return null;
        return () => ctl.armNow().pose[axis];
      }
      case 'wire':
      case 'in': {
        const i = wiring.rowIndex.get(rest);
        if (i === undefined) return null;
        return head === 'wire' ? () => wiring.readRow(i).level : () => wiring.readRow(i).value;
      }
      case 'link':
        return rest === 'healthy' ? () => b(wiring.linkHealthy()) : null;
      case 'fault':
        return () => b(board.cards.some((c) => c.card.id === rest && c.status === 'active'));
      case 'dev': {
        const d2 = rest.lastIndexOf('.');
        if (d2 < 0) return null;
        const d = devices.get(rest.slice(0, d2));
        if (!d) return null;
        const prop = rest.slice(d2 + 1);
        return () => {
          const s = deviceSnapshot(d, clock.now) as Record<string, unknown>;
          if (prop.startsWith('lamp')) return b(s.lamps ? Boolean((s.lamps as boolean[])[Number(prop.slice(4) || 0)]) : false);
          if (s.feedback && prop in (s.feedback as Record<string, boolean>)) return b((s.feedback as Record<string, boolean>)[prop]);
          const v = s[prop];
          return typeof v === 'boolean' ? b(v) : typeof v === 'number' ? v : 0;
        };
      }
    }
    return null;
  }
}
