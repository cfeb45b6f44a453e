import { createHash, randomBytes } from 'node:crypto';

/** SHA-256 (hex) of a link token: what the database keeps instead of the token itself. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** A new link token (32 random bytes, base64url: 43 characters) and its hash. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}
