import { z } from 'zod';

/**
 * Bodies and params of the PLC-link routes. Ports: 1024..65535 — 502 (the registered Modbus
 * port, MODBUS Messaging on TCP/IP Implementation Guide V1.0b §4.1) and other ports below
 * 1024 need root, which the app never has.
 */
export const PLC_LINK_LIMITS = { minPort: 1024, maxPort: 65535, minTimeoutMs: 100, maxTimeoutMs: 60_000, defaultTimeoutMs: 1000, defaultPort: 1502 } as const;

export const startPlcLinkSchema = z.object({
  cellId: z.uuid(),
  port: z.number().int().min(PLC_LINK_LIMITS.minPort).max(PLC_LINK_LIMITS.maxPort).default(PLC_LINK_LIMITS.defaultPort),
  linkTimeoutMs: z.number().int().min(PLC_LINK_LIMITS.minTimeoutMs).max(PLC_LINK_LIMITS.maxTimeoutMs).default(PLC_LINK_LIMITS.defaultTimeoutMs),
});
export type StartPlcLinkInput = z.infer<typeof startPlcLinkSchema>;

export const plcLinkIdParamSchema = z.object({ id: z.uuid() });

/** The register map as CSV (the default, a download) or as JSON rows (`?format=json`). */
export const registerMapQuerySchema = z.object({ format: z.enum(['csv', 'json']).default('csv') });
