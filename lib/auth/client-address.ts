import http from 'node:http';
import https from 'node:https';
import { isIP } from 'node:net';
import type { IncomingMessage } from 'node:http';
import type { TrustedProxies } from '@/lib/env';

/**
 * The request header that carries the TCP peer's address into route handlers.
 *
 * Why a header of our own: in Next.js 16 a route handler (and next-auth v4's `authorize`,
 * which only gets a copy of the request headers) never sees the socket. `NextRequest` has no
 * `ip`, and `next start` fills `X-Forwarded-For` from the socket only when the request has
 * none (`??=` in next/dist/server/base-server.js), so a client can choose that header's
 * value itself. `installPeerAddressHeader` (run once at start-up by instrumentation.ts)
 * writes the socket's `remoteAddress` into this header on every incoming request,
 * overwriting anything a client sent under the same name.
 */
export const PEER_ADDRESS_HEADER = 'x-cellwright-peer-address';

const installed = globalThis as unknown as { cellwrightPeerHeader?: boolean };

function stampPeer(req: IncomingMessage): void {
  const peer = req.socket?.remoteAddress;
  if (peer) req.headers[PEER_ADDRESS_HEADER] = peer;
  else delete req.headers[PEER_ADDRESS_HEADER];
}

/**
 * Stamp every request that reaches this process's HTTP(S) servers with its peer address.
 * Patches `emit` on the server prototypes, so it holds for a server created before or after
 * the call; idempotent.
 */
export function installPeerAddressHeader(): void {
  if (installed.cellwrightPeerHeader) return;
  for (const proto of [http.Server.prototype, https.Server.prototype] as { emit: (...args: unknown[]) => boolean }[]) {
    const original = proto.emit;
    proto.emit = function emitWithPeer(this: unknown, event: unknown, ...args: unknown[]) {
      if (event === 'request' || event === 'checkContinue' || event === 'checkExpectation') stampPeer(args[0] as IncomingMessage);
      return original.call(this, event, ...args);
    };
  }
  installed.cellwrightPeerHeader = true;
}

/** True once this process stamps peer addresses (false in unit tests and scripts). */
export function peerAddressHeaderInstalled(): boolean {
  return installed.cellwrightPeerHeader === true;
}

/** An address as one canonical string: `::ffff:` IPv4-mapped forms and ports dropped; null when it is no IP address. */
export function normalizeAddress(raw: string | null | undefined): string | null {
  if (!raw) return null;
  let value = raw.trim();
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(value);
  if (bracketed) value = bracketed[1];
  else if (/^\d{1,3}(\.\d{1,3}){3}:\d+$/.test(value)) value = value.slice(0, value.lastIndexOf(':'));
  const mapped = /^::ffff:(\d{1,3}(\.\d{1,3}){3})$/i.exec(value);
  if (mapped) value = mapped[1];
  return isIP(value) ? value.toLowerCase() : null;
}

type HeaderSource = Headers | Record<string, string | string[] | undefined> | undefined;

function headerValue(headers: HeaderSource, name: string): string | undefined {
  if (!headers) return undefined;
  if (headers instanceof Headers) return headers.get(name) ?? undefined;
  const v = headers[name];
  return Array.isArray(v) ? v.join(',') : v;
}

function trusted(proxies: TrustedProxies, address: string): boolean {
  return proxies.entries.length > 0 && proxies.list.check(address, isIP(address) === 6 ? 'ipv6' : 'ipv4');
}

/**
 * The client's address for rate limiting, or null when it cannot be known.
 *
 * - The peer is the socket's address (the stamped header above). Without TRUSTED_PROXY it
 *   is the answer: `X-Forwarded-For` is ignored, since any client can send one.
 * - When the peer is a trusted proxy, `X-Forwarded-For` is read from the right (the hop the
 *   proxy itself appended) and the first address that is not a trusted proxy is the client;
 *   hops further left were written by the client and are never believed.
 * - Null when the peer header is not stamped in this process (a handler called outside
 *   `next start`): per-address limits are then skipped and per-account limits still hold,
 *   rather than lumping every visitor under one shared key that anyone could exhaust.
 */
export function clientAddress(headers: HeaderSource, proxies: TrustedProxies): string | null {
  if (!peerAddressHeaderInstalled()) return null;
  const peer = normalizeAddress(headerValue(headers, PEER_ADDRESS_HEADER));
  if (!peer) return null;
  if (!trusted(proxies, peer)) return peer;
  const hops = (headerValue(headers, 'x-forwarded-for') ?? '')
    .split(',')
    .map((h) => h.trim())
    .filter(Boolean);
  // The nearest address we can vouch for so far: the peer, then each trusted hop to its left.
  let nearest = peer;
  for (let i = hops.length - 1; i >= 0; i--) {
    const hop = normalizeAddress(hops[i]);
    // Not an address: no proxy of ours writes that, so the chain is broken here; keep what we can vouch for.
    if (!hop) return nearest;
    if (!trusted(proxies, hop)) return hop;
    nearest = hop;
  }
  // Every hop is a proxy of ours (or none was sent): the request started inside.
  return nearest;
}
