/**
 * A terminal-strip endpoint as one short text, for the editable wiring table:
 * `start:contact` (device terminal), `%IX0.0` (PLC direct address), `R0.S1.C4` (controller
 * rack / slot / channel, channels from 0).
 */
import type { WiringRow } from '@/simulator';

type Endpoint = WiringRow['from'];

/** An endpoint as text. */
export function endpointText(e: Endpoint): string {
  if ('device' in e) return `${e.device}:${e.terminal}`;
  if ('plc' in e) return e.plc;
  return `R${e.controller.rack}.S${e.controller.slot}.C${e.controller.channel}`;
}

/** Parses endpoint text; null when it is none of the three forms. Ranges are checked by the engine's schema. */
export function parseEndpoint(text: string): Endpoint | null {
  const t = text.trim();
  if (t.startsWith('%')) return { plc: t.toUpperCase() };
  const c = /^R(\d{1,2})\.S(\d{1,2})\.C(\d{1,3})$/i.exec(t);
  if (c) return { controller: { rack: Number(c[1]), slot: Number(c[2]), channel: Number(c[3]) } };
  const d = /^([A-Za-z][A-Za-z0-9_.-]*):([A-Za-z0-9_-]+)$/.exec(t);
  if (d) return { device: d[1], terminal: d[2] };
  return null;
}
