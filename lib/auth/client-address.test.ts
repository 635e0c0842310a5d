import { beforeAll, describe, expect, it } from 'vitest';
import { parseEnv } from '@/lib/env';
import { PEER_ADDRESS_HEADER, clientAddress, installPeerAddressHeader, normalizeAddress } from './client-address';

const NO_PROXY = parseEnv({}).TRUSTED_PROXY;
const PROXY = parseEnv({ TRUSTED_PROXY: '10.0.0.5, 10.1.0.0/16, ::1' }).TRUSTED_PROXY;

function headers(peer: string | undefined, xff?: string): Headers {
  const h = new Headers();
  if (peer !== undefined) h.set(PEER_ADDRESS_HEADER, peer);
  if (xff !== undefined) h.set('x-forwarded-for', xff);
  return h;
}

describe('clientAddress', () => {
  it('knows no address until the peer stamp is installed in this process', () => {
    expect(clientAddress(headers('198.51.100.1'), NO_PROXY)).toBeNull();
  });

  describe('with the peer stamp', () => {
    beforeAll(() => installPeerAddressHeader());

    it('stamps a real server request with its socket peer, over a forged stamp', async () => {
      const http = await import('node:http');
      const server = http.createServer((req, res) => res.end(String(req.headers[PEER_ADDRESS_HEADER])));
      await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
      const { port } = server.address() as { port: number };
      try {
        const res = await fetch(`http://127.0.0.1:${port}/`, { headers: { [PEER_ADDRESS_HEADER]: '203.0.113.66' } });
        expect(await res.text()).toBe('127.0.0.1');
      } finally {
        server.close();
      }
    });

    it('is the socket peer, whatever X-Forwarded-For says, when no proxy is trusted', () => {
      expect(clientAddress(headers('198.51.100.1', '203.0.113.9'), NO_PROXY)).toBe('198.51.100.1');
      expect(clientAddress(headers('::ffff:198.51.100.1'), NO_PROXY)).toBe('198.51.100.1');
    });

    it('is unknown (null) without a peer', () => {
      expect(clientAddress(headers(undefined, '203.0.113.9'), NO_PROXY)).toBeNull();
    });

    it('ignores X-Forwarded-For from a peer that is not a trusted proxy', () => {
      expect(clientAddress(headers('198.51.100.1', '203.0.113.9'), PROXY)).toBe('198.51.100.1');
    });

    it('takes the hop the trusted proxy appended, not what the client wrote before it', () => {
      // The client sent "X-Forwarded-For: 192.0.2.66"; the proxy appended the real address.
      expect(clientAddress(headers('10.0.0.5', '192.0.2.66, 203.0.113.9'), PROXY)).toBe('203.0.113.9');
    });

    it('walks through a chain of trusted proxies', () => {
      expect(clientAddress(headers('10.0.0.5', '192.0.2.66, 203.0.113.9, 10.1.4.4'), PROXY)).toBe('203.0.113.9');
      expect(clientAddress(headers('::1', '203.0.113.9:51234'), PROXY)).toBe('203.0.113.9');
    });

    it('keeps the nearest trusted address when the chain holds garbage or only proxies', () => {
      expect(clientAddress(headers('10.0.0.5', 'not-an-ip, 10.1.4.4'), PROXY)).toBe('10.1.4.4');
      expect(clientAddress(headers('10.0.0.5'), PROXY)).toBe('10.0.0.5');
    });
  });
});

describe('normalizeAddress', () => {
  it.each([
    ['203.0.113.9', '203.0.113.9'],
    [' ::FFFF:203.0.113.9 ', '203.0.113.9'],
    ['203.0.113.9:443', '203.0.113.9'],
    ['[2001:db8::1]:443', '2001:db8::1'],
    ['2001:DB8::1', '2001:db8::1'],
    ['unknown', null],
    ['', null],
  ])('%j → %j', (input, expected) => {
    expect(normalizeAddress(input)).toBe(expected);
  });
});

describe('TRUSTED_PROXY', () => {
  it('refuses an entry that is not an address or CIDR range', () => {
    expect(() => parseEnv({ TRUSTED_PROXY: '10.0.0.5, proxy.local' })).toThrow(/TRUSTED_PROXY.*proxy\.local/);
    expect(() => parseEnv({ TRUSTED_PROXY: '10.0.0.0/33' })).toThrow(/TRUSTED_PROXY/);
  });
});
