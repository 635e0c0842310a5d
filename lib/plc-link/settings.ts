import 'server-only';
import { isIP } from 'node:net';
import { z } from 'zod';

/**
 * PLC-link settings, parsed here in one place (zod) rather than in lib/env.ts, which this
 * feature does not own:
 *
 * - `PLC_LINK_INTERFACE`: the address the Modbus TCP servers bind to. Default `127.0.0.1`
 *   (loopback: only programs on this machine reach it). A bench PLC on a separate, isolated
 *   network needs that network's interface address here; `0.0.0.0` binds every interface.
 * - `PLC_LINK_MAX_SESSIONS` (default 4) per server process, `PLC_LINK_MAX_PER_USER` (default 1).
 * - `PLC_LINK_IDLE_MINUTES` (default 15): a session nobody has viewed for this long stops.
 */
const settingsSchema = z.object({
  PLC_LINK_INTERFACE: z
    .string()
    .trim()
    .default('127.0.0.1')
    .refine((v) => isIP(v) !== 0, 'PLC_LINK_INTERFACE must be an IPv4 or IPv6 address'),
  PLC_LINK_MAX_SESSIONS: z.coerce.number().int().min(1).max(64).default(4),
  PLC_LINK_MAX_PER_USER: z.coerce.number().int().min(1).max(16).default(1),
  PLC_LINK_IDLE_MINUTES: z.coerce.number().min(0.05).max(24 * 60).default(15),
});

export type PlcLinkSettings = z.infer<typeof settingsSchema>;

export function plcLinkSettings(source: NodeJS.ProcessEnv = process.env): PlcLinkSettings {
  const pick = (k: string) => (source[k] === '' ? undefined : source[k]);
  return settingsSchema.parse({
    PLC_LINK_INTERFACE: pick('PLC_LINK_INTERFACE'),
    PLC_LINK_MAX_SESSIONS: pick('PLC_LINK_MAX_SESSIONS'),
    PLC_LINK_MAX_PER_USER: pick('PLC_LINK_MAX_PER_USER'),
    PLC_LINK_IDLE_MINUTES: pick('PLC_LINK_IDLE_MINUTES'),
  });
}
