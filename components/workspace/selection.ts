/**
 * What else the shared selection touches, so every area can highlight the same signal: a
 * device selects its terminal-strip rows and the PLC addresses they land on; a row selects its
 * devices and addresses; an address selects its rows and devices.
 */
import type { WiringRow } from '@/simulator';
import type { Selection } from './contract';
import { endpointText } from './endpoint-text';

export type Related = { devices: Set<string>; wires: Set<string>; addresses: Set<string>; channels: Set<string> };

/** Everything linked to the selection through the terminal strip (the selection itself included). */
export function relatedToSelection(selection: Selection, wiring: WiringRow[]): Related {
  const out: Related = { devices: new Set(), wires: new Set(), addresses: new Set(), channels: new Set() };
  if (!selection) return out;
  const add = (row: WiringRow) => {
    out.wires.add(row.id);
    for (const end of [row.from, row.to]) {
      if ('device' in end) out.devices.add(end.device);
      else if ('plc' in end) out.addresses.add(end.plc);
      else out.channels.add(endpointText(end));
    }
  };
  for (const row of wiring) {
    const ends = [row.from, row.to];
    const hit =
      (selection.kind === 'wire' && row.id === selection.id) ||
      (selection.kind === 'device' && ends.some((e) => 'device' in e && e.device === selection.id)) ||
      (selection.kind === 'address' && ends.some((e) => 'plc' in e && e.plc === selection.id));
    if (hit) add(row);
  }
  if (selection.kind === 'device') out.devices.add(selection.id);
  if (selection.kind === 'address') out.addresses.add(selection.id);
  if (selection.kind === 'wire') out.wires.add(selection.id);
  return out;
}
