/**
 * Which monitor targets carry the e-stop chain or a guard, so forcing one asks first. Pure,
 * from the cell document: the PLC addresses and controller points wired to an e-stop or a guard
 * switch, the controller points the handshake reads as "e-stop chain healthy" and "guard
 * closed", and the PLC addresses wired on to those points. One hop of logic is not followed:
 * the sheet may pass the signal through any block, and a sheet is the student's to change.
 */
import { formatAddress, parseAddress, resolvePointMap, type CellDocument, type WiringRow } from '@/simulator';

export type SafetyCarrier = 'e-stop chain' | 'guard';

type Endpoint = WiringRow['from'];

/** `%ix0.2` and `%IX0.2` are one address; the monitor lists the canonical form. */
function canonicalAddressText(text: string): string {
  const a = parseAddress(text);
  return a.ok ? formatAddress(a.value) : text;
}

/** Target (`%IX0.2`, `DI5`) → what it carries. */
export function safetyCarriers(document: CellDocument): Map<string, SafetyCarrier> {
  const out = new Map<string, SafetyCarrier>();
  const map = resolvePointMap(document.controller.pointMap);
  const kindOf = new Map<string, SafetyCarrier>();
  for (const d of document.panel) if (d.type === 'e-stop') kindOf.set(d.id, 'e-stop chain');
  for (const d of document.field) if (d.type === 'guard-switch') kindOf.set(d.id, 'guard');

  const mark = (end: Endpoint, kind: SafetyCarrier) => {
    if ('plc' in end) out.set(canonicalAddressText(end.plc), kind);
    else if ('controller' in end) {
      const c = end.controller;
      for (const ref of map.byChannel.get(`${c.rack}.${c.slot}.${c.channel}`) ?? []) out.set(ref, kind);
    }
  };
  // The devices themselves, and whatever their contacts are wired to.
  for (const row of document.wiring) {
    for (const [here, there] of [
      [row.from, row.to],
      [row.to, row.from],
    ] as const) {
      if ('device' in here && kindOf.has(here.device)) mark(there, kindOf.get(here.device)!);
    }
  }
  // The handshake's own safety inputs on the controller.
  const roles = document.controller.handshake.inputs;
  if (roles.estopHealthy) out.set(roles.estopHealthy, 'e-stop chain');
  if (roles.guardClosed) out.set(roles.guardClosed, 'guard');
  // PLC outputs wired to a channel of a point that carries one (the PLC passing "guard closed" on).
  for (const row of document.wiring) {
    for (const [here, there] of [
      [row.from, row.to],
      [row.to, row.from],
    ] as const) {
      if (!('controller' in here) || !('plc' in there)) continue;
      const c = here.controller;
      for (const ref of map.byChannel.get(`${c.rack}.${c.slot}.${c.channel}`) ?? []) {
        const kind = out.get(ref);
        if (kind) out.set(canonicalAddressText(there.plc), kind);
      }
    }
  }
  return out;
}
