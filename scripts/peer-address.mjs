// How scripts/serve.mjs tells the app the address of each connection, which Next's route handlers
// cannot see: a header of our own, always overwritten with the socket's address (so a value a
// client sent under that name never arrives), and a flag on globalThis saying the header is ours.
// lib/server/auth/client-address.ts reads both; the names must stay the same there.

export const PEER_HEADER = 'x-switchback-peer';
export const PEER_STAMPED = Symbol.for('switchback.peerHeaderStamped');

/** Marks this process: from now on PEER_HEADER on incoming requests comes from the socket. */
export function announcePeerStamping() {
  globalThis[PEER_STAMPED] = true;
}

/** @param {import('node:http').IncomingMessage} request */
export function stampPeerAddress(request) {
  request.headers[PEER_HEADER] = request.socket.remoteAddress ?? '';
}
