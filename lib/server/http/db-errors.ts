import { ConnectionError, ConnectionAcquireTimeoutError } from 'sequelize';

const UNAVAILABLE_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ER_GET_CONNECTION_TIMEOUT', 'ER_CONNECTION_TIMEOUT', 'ER_SOCKET_UNEXPECTED_CLOSE', 'ER_CONNECTION_ALREADY_CLOSED', 'PROTOCOL_CONNECTION_LOST']);

/** True when an error means the database cannot be reached (rather than a bad query). */
export function isDatabaseUnavailable(error: unknown): boolean {
  if (error instanceof ConnectionError || error instanceof ConnectionAcquireTimeoutError) return true;
  let current: unknown = error;
  for (let depth = 0; current && depth < 4; depth++) {
    const code = (current as { code?: string }).code;
    if (code && UNAVAILABLE_CODES.has(code)) return true;
    current = (current as { parent?: unknown; original?: unknown; cause?: unknown }).parent ?? (current as { original?: unknown }).original ?? (current as { cause?: unknown }).cause;
  }
  return false;
}
