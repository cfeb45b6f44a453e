import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { describe, expect, it } from 'vitest';
import { PEER_HEADER, UNKNOWN_ADDRESS, addressMatcher, clientAddress } from '@/lib/server/auth/client-address';
import { PEER_HEADER as SERVED_HEADER, PEER_STAMPED, stampPeerAddress } from '@/scripts/peer-address.mjs';

const stamped = { stamped: true, trustedProxies: [] as string[] };

describe('the address rate limits count', () => {
  it('ignores every client-set header where no server stamped the connection’s address (next dev, tests)', () => {
    const headers = { 'x-forwarded-for': '203.0.113.7', 'x-real-ip': '203.0.113.8', [PEER_HEADER]: '203.0.113.9' };
    expect(clientAddress(headers, { stamped: false, trustedProxies: [] })).toBe(UNKNOWN_ADDRESS);
  });

  it('is the connection’s own address, whatever X-Forwarded-For claims, when no proxy is trusted', () => {
    expect(clientAddress({ [PEER_HEADER]: '198.51.100.4', 'x-forwarded-for': '203.0.113.7' }, stamped)).toBe('198.51.100.4');
    expect(clientAddress(new Headers({ [PEER_HEADER]: '::ffff:198.51.100.4', 'x-forwarded-for': '1.2.3.4' }), stamped)).toBe('198.51.100.4');
    expect(clientAddress({ 'x-forwarded-for': '203.0.113.7' }, stamped)).toBe(UNKNOWN_ADDRESS);
  });

  it('behind a trusted proxy, is the right-most hop that is not itself a trusted proxy', () => {
    const behind = { stamped: true, trustedProxies: ['10.0.0.0/8', '127.0.0.1'] };
    // The client claimed 203.0.113.7; the proxy at 10.1.2.3 appended the address it saw, 198.51.100.4.
    expect(clientAddress({ [PEER_HEADER]: '10.1.2.3', 'x-forwarded-for': '203.0.113.7, 198.51.100.4' }, behind)).toBe('198.51.100.4');
    expect(clientAddress({ [PEER_HEADER]: '127.0.0.1', 'x-forwarded-for': '198.51.100.4, 10.9.9.9' }, behind)).toBe('198.51.100.4');
    // A connection from elsewhere is not the proxy: its X-Forwarded-For counts for nothing.
    expect(clientAddress({ [PEER_HEADER]: '192.0.2.50', 'x-forwarded-for': '203.0.113.7' }, behind)).toBe('192.0.2.50');
    expect(clientAddress({ [PEER_HEADER]: '10.1.2.3' }, behind)).toBe('10.1.2.3');
  });

  it('matches IPv4 and IPv6 addresses and ranges', () => {
    const matches = addressMatcher(['192.0.2.0/24', '2001:db8::/32', '::1']);
    expect(matches('192.0.2.200')).toBe(true);
    expect(matches('::ffff:192.0.2.1')).toBe(true);
    expect(matches('192.0.3.1')).toBe(false);
    expect(matches('2001:db8::42')).toBe(true);
    expect(matches('::1')).toBe(true);
    expect(matches('not an address')).toBe(false);
  });
});

describe('the production server’s stamp', () => {
  it('uses the header and flag names the app reads', () => {
    expect(SERVED_HEADER).toBe(PEER_HEADER);
    expect(PEER_STAMPED).toBe(Symbol.for('switchback.peerHeaderStamped'));
  });

  it('overwrites a client-sent peer header with the socket’s address', async () => {
    const server = createServer((request, response) => {
      stampPeerAddress(request);
      response.end(JSON.stringify(request.headers[PEER_HEADER]));
    });
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    try {
      const { port } = server.address() as AddressInfo;
      const reply = await fetch(`http://127.0.0.1:${port}/`, { headers: { [PEER_HEADER]: '203.0.113.7', 'x-forwarded-for': '203.0.113.8' } });
      expect(await reply.json()).toBe('127.0.0.1');
    } finally {
      await new Promise((resolve) => server.close(resolve));
    }
  });
});
