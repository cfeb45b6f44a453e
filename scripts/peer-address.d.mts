import type { IncomingMessage } from 'node:http';

export const PEER_HEADER: 'x-switchback-peer';
export const PEER_STAMPED: unique symbol;
export function announcePeerStamping(): void;
export function stampPeerAddress(request: IncomingMessage): void;
