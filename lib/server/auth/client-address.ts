import { BlockList, isIPv4, isIPv6 } from 'node:net';
import { proxyEnv } from '@/lib/server/env';

/**
 * The header in which scripts/serve.mjs hands Next the address of the connection. It overwrites
 * whatever a client sent under that name, so inside the app the value is the socket's own.
 * Same name as in scripts/peer-address.mjs (a unit test checks).
 */
export const PEER_HEADER = 'x-switchback-peer';

// Set by scripts/serve.mjs in its own process (where Next runs too): only then does PEER_HEADER
// come from the socket. Under `next dev` or in tests nobody stamps it, and the header is ignored.
const STAMPED = Symbol.for('switchback.peerHeaderStamped');

/** The address counted for callers whose address cannot be known (`next dev`, direct handler calls). */
export const UNKNOWN_ADDRESS = 'unknown';

/**
 * Marks this process as one whose PEER_HEADER is written from the socket, as scripts/serve.mjs
 * does for itself; tests that stand in for it call this (and undo it with `false`).
 */
export function setPeerHeaderStamped(stamped: boolean): void {
  (globalThis as Record<symbol, unknown>)[STAMPED] = stamped;
}

function peerHeaderStamped(): boolean {
  return (globalThis as Record<symbol, unknown>)[STAMPED] === true;
}

/** '::ffff:192.0.2.1' (an IPv4 peer on a dual-stack socket) as '192.0.2.1'; other forms unchanged. */
function plain(address: string): string {
  const trimmed = address.trim();
  const mapped = /^::ffff:(\d{1,3}(?:\.\d{1,3}){3})$/i.exec(trimmed);
  return mapped ? mapped[1] : trimmed;
}

/** A matcher for a list of addresses and CIDR ranges (as TRUSTED_PROXIES holds them). */
export function addressMatcher(entries: readonly string[]): (address: string) => boolean {
  const list = new BlockList();
  for (const entry of entries) {
    const [base, bits] = entry.split('/');
    const type = isIPv6(base) ? 'ipv6' : 'ipv4';
    if (bits === undefined) list.addAddress(plain(base), type);
    else list.addSubnet(plain(base), Number(bits), type);
  }
  return (address) => {
    const value = plain(address);
    if (isIPv4(value)) return list.check(value, 'ipv4');
    if (isIPv6(value)) return list.check(value, 'ipv6');
    return false;
  };
}

function header(headers: Headers | Record<string, unknown> | undefined, name: string): string | undefined {
  if (!headers) return undefined;
  if (headers instanceof Headers) return headers.get(name) ?? undefined;
  const value = headers[name];
  return typeof value === 'string' ? value : Array.isArray(value) ? value.join(',') : undefined;
}

/**
 * The caller's address for rate limits. It is the connection's address (PEER_HEADER, trusted only
 * where scripts/serve.mjs wrote it); a client-set X-Forwarded-For counts for nothing unless that
 * connection comes from a proxy listed in TRUSTED_PROXIES, and then the right-most hop that is not
 * itself a trusted proxy is the caller (the hops to its left are whatever the client claimed).
 * Without a stamped peer address the answer is UNKNOWN_ADDRESS: one shared count, never a header.
 */
export function clientAddress(
  headers: Headers | Record<string, unknown> | undefined,
  options: { trustedProxies?: readonly string[]; stamped?: boolean } = {},
): string {
  const stamped = options.stamped ?? peerHeaderStamped();
  const peer = stamped ? header(headers, PEER_HEADER)?.trim() : undefined;
  if (!peer) return UNKNOWN_ADDRESS;
  const trusted = addressMatcher(options.trustedProxies ?? proxyEnv().TRUSTED_PROXIES);
  if (!trusted(peer)) return plain(peer);
  const hops = (header(headers, 'x-forwarded-for') ?? '').split(',').map((hop) => plain(hop)).filter(Boolean);
  for (let i = hops.length - 1; i >= 0; i--) if (!trusted(hops[i])) return hops[i];
  return hops[0] ?? plain(peer);
}
