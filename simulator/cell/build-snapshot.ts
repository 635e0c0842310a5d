/**
 * The snapshot of a running cell (the picture snapshot.ts describes): built from the rooms
 * without changing any of them, so taking one never changes a run.
 */
import { formatAddress, readAddress } from '@/simulator/address';
import { INPUT_FAMILIES } from '@/simulator/controller/point-map';
import { supplyWithinTolerance } from '@/simulator/electrical';
import { deviceSnapshot } from './devices';
import type { CellParts } from './parts';
import type { CellSnapshot, WireSnapshot } from './snapshot';

/** Bytes of an area up to the highest non-zero one (at least four). */
function used(a: Uint8Array): number[] {
  let last = -1;
  for (let i = 0; i < a.length; i++) if (a[i] !== 0) last = i;
  return Array.from(a.subarray(0, Math.max(last + 1, 4)));
}

/** The full picture of the cell now. */
export function buildSnapshot(parts: CellParts): CellSnapshot {
  const { clock, doc, wiring, plc, controller: ctl, faults, board, forces, devices } = parts;
  const now = clock.now;
  const ctx = ctl.ctx();
  const { state, detail } = ctl.stateName();
  const wires: WireSnapshot[] = wiring.plans.map((p, i) => {
    const r = wiring.readRow(i);
    const ids = faults.rowFaults[i]?.ids ?? [];
    return { id: p.row.id, level: r.level, unit: r.unit, reading: r.reading, ...(r.loop ? { loop: r.loop } : {}), faults: [...ids], isLink: p.isLink };
  });
  const addresses: Record<string, { value: number; forced: boolean }> = {};
  const addAddr = (text: string) => {
    addresses[text] = { value: readAddress(plc.image, text), forced: forces.has(text) };
  };
  for (const p of wiring.plans) {
    if (p.sink.kind !== 'device' && p.sink.kind !== 'controller') addAddr(formatAddress(p.sink.address));
    if (p.source.kind === 'plc-bit' || p.source.kind === 'plc-word') addAddr(formatAddress(p.source.address));
  }
  for (const t of forces.keys()) if (t.startsWith('%')) addAddr(t);
  const points = [...ctl.resolved.byRef.values()].map((pt) => ({
    ref: pt.ref,
    label: pt.label,
    invert: pt.invert,
    rack: pt.rack,
    slot: pt.slot,
    channel: pt.channel,
    rowId: pt.rowId,
    value: (INPUT_FAMILIES.has(pt.family) ? ctl.logicalIn[pt.ref] : ctl.logicalOut[pt.ref]) ?? 0,
    forced: forces.has(pt.ref),
  }));
  const channels: Record<string, number[]> = {};
  for (const [k, a] of ctl.ctlIn) channels[k] = Array.from(a);
  for (const [k, a] of ctl.ctlOut) channels[k] = Array.from(a);
  const arm = ctl.armNow();
  return {
    timeMs: now,
    seed: parts.seed,
    devices: [...devices.values()].map((d) => deviceSnapshot(d, now)),
    wires,
    plc: {
      scans: plc.state.scans,
      scanPeriodMs: plc.scanMs,
      image: { I: used(plc.image.I), Q: used(plc.image.Q), M: used(plc.image.M) },
      addresses,
      blockOutputs: plc.sheet.readBlockOutputs(plc.state),
      moduleFaults: doc.plc.modules.filter((m) => faults.moduleDead(m.id)).map((m) => m.id),
    },
    link: { kind: doc.link.kind, healthy: wiring.linkHealthy(), lastUpdateMs: wiring.lastBusMs },
    supply: { volts: faults.supplyV, withinTolerance: supplyWithinTolerance(faults.supplyV) },
    controller: {
      state,
      detail,
      powered: state !== 'off',
      servoOn: ctx.servoOn,
      pc: ctx.pc,
      stepElapsedMs: ctl.stepElapsedNow(ctx),
      holdReason: ctx.holdReason,
      cyclesCompleted: ctx.cyclesCompleted,
      alarms: ctx.alarms.map((a) => ({ ...a })),
      points,
      handshake: ctl.handshakeOutputs(),
      pointMap: ctl.pointMap.live,
      staged: ctl.pointMap.staged,
      moduleFaults: doc.controller.modules.filter((m) => faults.moduleDead(m.id)).map((m) => m.id),
      channels,
    },
    arm: { pose: [...arm.pose], speed: arm.speed, moving: arm.moving, target: ctx.lastTarget },
    faults: board.cards.map((c) => ({ card: c.card, status: c.status, since: c.since })),
    forces: Object.fromEntries(forces),
  };
}
